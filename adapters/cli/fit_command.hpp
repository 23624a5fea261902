#pragma once
// `elyblock fit` (fit_command.cpp): returns the exit status; prints its own messages.
int run_fit_command(int argc, char** argv);
