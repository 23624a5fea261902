#pragma once
// The subcommands of `elyblock`, in the order its help lists them. Adding one: its file
// cmd_<name>.cpp defining `elycli::Command elycli::command_<name>()` (command.hpp), and one
// line `X(<name>) \` here, above the closing comment.
#define ELYBLOCK_COMMANDS(X) \
    X(solve)                 \
    X(sweep)                 \
    X(run)                   \
    X(fit)                   \
    X(fmu)                   \
    X(variables)             \
    X(water)                 \
    X(version)               \
    /* end of the list */
