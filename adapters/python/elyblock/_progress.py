"""Progress and cancellation of long calls (batches and fits).

A long C call takes a progress callback that it calls now and then (the batch every 1024
points and after the last, the fit after every iteration); a non-zero return cancels the call,
which then returns ELY_ERR_CANCELLED. ``Monitor`` builds that callback from the caller's wish:

- ``progress=None`` (default): a tqdm bar on stderr when stderr is a terminal, shown only if
  the call lasts longer than half a second; nothing otherwise.
- ``progress=True``: always a tqdm bar; ``progress=False``: never.
- ``progress=callable``: ``callable(done, total)`` is called instead of a bar; a true return
  value cancels the call (the caller then gets ``CancelledError`` with the partial result).

Ctrl-C: while a batch of CATCH_INTERRUPT_POINTS or more (or any fit) runs on the main thread with Python's
default SIGINT handler, the handler is replaced by one that only records the interrupt; the
next progress call returns non-zero, the library stops, and KeyboardInterrupt is raised once
the call has returned (so the library is never left in the middle of anything). A smaller call
ends within milliseconds and the interrupt is raised as usual (or, arriving inside a progress
call, cancels like an exception of a callable). An exception raised by a callable cancels the
call the same way and is re-raised afterwards.
"""
import signal
import sys
import threading

from . import _capi

#: A bar in the default mode appears only for calls that last longer than this, in seconds.
AUTO_BAR_DELAY = 0.5
#: Points from which a call catches Ctrl-C itself (a smaller call ends within milliseconds, after
#: which the interrupt is raised as usual); the library reports progress every 1024 points.
CATCH_INTERRUPT_POINTS = 100_000
NO_CALLBACK = _capi.PROGRESS()  # a NULL ely_progress_fn


def _bar(total, description, delay, unit="pt"):
    try:
        from tqdm import tqdm
    except ImportError as e:  # python3-tqdm is missing
        raise ImportError("a progress bar needs tqdm (Debian: apt-get install python3-tqdm)") from e
    return tqdm(total=total, desc=description, unit=unit, unit_scale=True, delay=delay, leave=False,
                file=sys.stderr)


def _stderr_is_terminal():
    try:
        return sys.stderr is not None and sys.stderr.isatty()
    except (AttributeError, ValueError):
        return False


class Monitor:
    """Context manager around one long C call; ``callback`` is what to pass to the library."""

    def __init__(self, progress, total, description, catch_interrupt=None, unit="pt"):
        self.user_function = progress if callable(progress) else None
        self.total = total
        self.description = description
        self.want_bar = progress is True or (progress is None and _stderr_is_terminal())
        self.bar_delay = AUTO_BAR_DELAY if progress is None else 0.0
        self.bar = None
        self.done = 0
        self.interrupted = False
        self.cancelled_by_user = False
        self.error = None
        self._previous_handler = None
        # None: by size (a batch); True: always (a fit, whose iterations each take a whole batch).
        self._catch_interrupt = total >= CATCH_INTERRUPT_POINTS if catch_interrupt is None else catch_interrupt
        self.unit = unit
        needed = self.want_bar or self.user_function is not None or self._catch_interrupt
        self.callback = _capi.PROGRESS(self._on_progress) if needed else NO_CALLBACK

    def __enter__(self):
        if self.want_bar:
            try:
                self.bar = _bar(self.total, self.description, self.bar_delay, self.unit)
            except ImportError:
                if self.user_function is None and self.bar_delay > 0:  # the automatic bar is a nicety
                    self.bar = None
                else:
                    raise
        if (self._catch_interrupt and threading.current_thread() is threading.main_thread()
                and signal.getsignal(signal.SIGINT) is signal.default_int_handler):
            self._previous_handler = signal.signal(signal.SIGINT, self._on_interrupt)
        return self

    def __exit__(self, *exc):
        if self._previous_handler is not None:
            signal.signal(signal.SIGINT, self._previous_handler)
        if self.bar is not None:
            self.bar.close()
        return False

    def _on_interrupt(self, signum, frame):
        self.interrupted = True

    def step(self, done):
        """Progress to ``done`` points: advances the bar, calls the caller's callable; True means stop."""
        if self.bar is not None:
            self.bar.update(done - self.done)
        self.done = done
        if self.user_function is not None and self.user_function(done, self.total):
            self.cancelled_by_user = True
        return self.cancelled_by_user

    def _on_progress(self, done, total, user):
        try:
            return 1 if self.interrupted or self.step(done) else 0
        except BaseException as e:  # KeyboardInterrupt from a custom handler, or the callable's own error
            self.error = e
            return 1

    def reraise(self):
        """After the call: KeyboardInterrupt for a Ctrl-C, the callable's exception if it raised."""
        if self.interrupted:
            raise KeyboardInterrupt
        if self.error is not None:
            raise self.error
