"""Batches on a Dask distributed cluster (Debian python3-distributed).

    from dask.distributed import Client
    import elyblock.distributed
    client = Client("tcp://scheduler.example:8786")      # a running cluster; or Client(LocalCluster())
    result = elyblock.distributed.batch(client, "plant.json", {"in.current_density": j}, ["cell.voltage"])

``batch`` takes the arguments of ``Block.batch`` (with the plant first) and gives the same
result, in the same order: the points are split into tasks of consecutive rows, solved on the
workers and put back together. ``batch_plants`` runs one batch per plant description (a Monte
Carlo over plant parameters) and returns one result per plant, optionally reduced on the worker.

What travels: the plant as JSON text (a path is read here, so workers need not see the file),
the variable names and the input rows; never a library handle. Each worker process loads the
library once, when it first imports elyblock, and keeps a Block per plant text and thread.
Workers must be able to import elyblock: on a real cluster, install the package and its library
on every worker (``cmake --install``, or the same PYTHONPATH); a LocalCluster's worker processes
inherit the client's.

Results equal a local batch bit for bit when every point is solved directly (the current-density
spec); a spec solved by iteration (power, current, hydrogen_rate, voltage) starts each task from
the block's own state rather than from the previous point, which changes its iterations and so
its last digits (well within 1e-12 relative; the solve's own tolerance is far tighter than any
use needs).
"""
import math
import os
import threading
import warnings
from collections import OrderedDict

import numpy as np

from . import _capi, _progress, errors
from ._batch import Table, assemble, failure_message, output_names
from .block import Block, plant_text

#: Fewest points in one task: scheduling a task costs about 2 ms, a point 0.3 to 2 us.
MIN_POINTS_PER_TASK = 2000
#: Tasks per worker when the batch is large enough: a few, so that a slow worker does not hold all.
TASKS_PER_WORKER = 4
#: Blocks a worker thread keeps (one per plant text and spec, least recently used dropped).
BLOCKS_PER_THREAD = 8

_local = threading.local()
_created = {"blocks": 0}
_created_lock = threading.Lock()


# ---- on the workers ---------------------------------------------------------------------------

def _worker_block(text, spec):
    blocks = getattr(_local, "blocks", None)
    if blocks is None:
        blocks = _local.blocks = OrderedDict()
    key = (text, spec)
    block = blocks.get(key)
    if block is None:
        block = Block(text)
        if spec is not None:
            block.set_spec(spec)
        blocks[key] = block
        while len(blocks) > BLOCKS_PER_THREAD:
            blocks.popitem(last=False)
        with _created_lock:
            _created["blocks"] += 1
    else:
        blocks.move_to_end(key)
    return block


def _solve_rows(text, spec, inputs, outputs, matrix):
    """One task: the C batch over some rows. Returns (values, point statuses, call status, message)."""
    block = _worker_block(text, spec)
    values, status, call_status, message = block._run_batch(Table(inputs, matrix, (len(matrix),)), outputs,
                                                             progress=False)
    return values, status, int(call_status), message


def _solve_plant(number, text, spec, inputs, outputs, matrix, shape, index, with_status, reduce):
    """One task of batch_plants: a whole batch for one plant, assembled (and reduced) here."""
    try:
        block = _worker_block(text, spec)
        values, status, call_status, message = block._run_batch(Table(inputs, matrix, shape), outputs,
                                                                 progress=False)
    except errors.ElyError as e:
        raise type(e)(f"plant {number}: {e.message}", e.status) from None
    result = assemble(Table(inputs, matrix, shape, index), outputs, values, status, with_status)
    failed = int(np.count_nonzero(status < 0))
    return (reduce(result) if reduce is not None else result), failed, message


def worker_state():
    """What this process holds: its pid, the library it loaded and how many Blocks it created
    (for ``client.run(elyblock.distributed.worker_state)``)."""
    return {"pid": os.getpid(), "library": _capi.library_path, "blocks_created": _created["blocks"]}


# ---- on the client ----------------------------------------------------------------------------

def _checked_inputs(text, spec, table, outputs):
    """Checks the plant, the spec and the names here, with the errors a local batch gives (a
    batch of no points checks everything but the values), and returns the full input names."""
    block = Block(text)
    names = [block._input_index(name)[0] for name in table.names]
    block._run_batch(Table(names, np.empty((0, len(names))), (0,)), outputs, spec, progress=False)
    return names


def _worker_count(client):
    return max(1, len(client.scheduler_info().get("workers", {})))


def _collect(client, futures, sizes, progress, total):
    """Waits for the futures with progress; returns their results in order. Ctrl-C or a callable
    that asks to stop cancels what is left."""
    from distributed import as_completed

    results = [None] * len(futures)
    position = {future.key: i for i, future in enumerate(futures)}
    # Ctrl-C interrupts the wait for the futures as usual: no need to catch it on the way.
    monitor = _progress.Monitor(progress, total, "batch", catch_interrupt=False)
    done = 0
    try:
        with monitor:
            for future in as_completed(futures):
                i = position[future.key]
                results[i] = future.result()
                done += sizes[i]
                if monitor.step(done):
                    break
    except BaseException:
        client.cancel(futures)
        raise
    if monitor.cancelled_by_user:
        client.cancel(futures)
    return results, monitor.cancelled_by_user


def batch(client, plant, inputs, outputs, *, spec=None, with_status=False, progress=None, points_per_task=None):
    """``Block(plant).batch(inputs, outputs, ...)`` on the workers of ``client``, a
    ``distributed.Client``. Same arguments and result; ``points_per_task`` overrides the split
    (default: about four tasks per worker, at least MIN_POINTS_PER_TASK points each)."""
    text = plant_text(plant)
    table = Table.from_inputs(inputs)
    outputs = output_names(outputs)
    names = _checked_inputs(text, spec, table, outputs)
    n = table.points
    size = points_per_task or max(MIN_POINTS_PER_TASK, math.ceil(n / (TASKS_PER_WORKER * _worker_count(client))))
    starts = list(range(0, n, size))
    sizes = [min(size, n - start) for start in starts]
    futures = [client.submit(_solve_rows, text, spec, names, outputs, table.matrix[start:start + count], pure=False)
               for start, count in zip(starts, sizes)]
    parts, cancelled = _collect(client, futures, sizes, progress, n)

    values = np.full((n, len(outputs)), np.nan)
    status = np.full(n, errors.Status.CANCELLED, dtype=np.int32)
    first_failure = None
    for start, count, part in zip(starts, sizes, parts):
        if part is None:
            continue
        values[start:start + count], status[start:start + count] = part[0], part[1]
        if part[2] == errors.Status.PARTIAL and first_failure is None:
            first_failure = f"in the task from point {start}: {part[3]}"
    result = assemble(table, outputs, values, status, with_status)
    if cancelled:
        raise errors.CancelledError("batch cancelled by the progress callback", errors.Status.CANCELLED, result)
    if first_failure is not None:
        warnings.warn(errors.ElyWarning(failure_message(status, first_failure)), stacklevel=2)
    return result


def batch_plants(client, plants, inputs, outputs, *, spec=None, with_status=False, reduce=None, progress=None):
    """One batch per plant description, all with the same inputs and outputs, on the workers:
    a list of results in the order of ``plants`` (each as ``Block.batch`` gives it), or of
    ``reduce(result)`` when ``reduce`` is given (run on the worker, so only what it returns
    travels back; it must pickle, e.g. a module-level function)."""
    texts = [plant_text(p) for p in plants]
    table = Table.from_inputs(inputs)
    outputs = output_names(outputs)
    if not texts:
        return []
    names = _checked_inputs(texts[0], spec, table, outputs)
    [matrix] = client.scatter([table.matrix], broadcast=True, hash=False)  # a fresh key: an equal one may be in release
    futures = [client.submit(_solve_plant, i, text, spec, names, outputs, matrix, table.shape, table.index,
                             with_status, reduce, pure=False) for i, text in enumerate(texts)]
    parts, cancelled = _collect(client, futures, [1] * len(texts), progress, len(texts))
    if cancelled:
        raise errors.CancelledError("batch cancelled by the progress callback", errors.Status.CANCELLED,
                                    [None if p is None else p[0] for p in parts])
    failing = [i for i, p in enumerate(parts) if p[1]]
    if failing:
        i = failing[0]
        warnings.warn(errors.ElyWarning(f"{len(failing)} of {len(texts)} plants had failed points; first: plant {i}: "
                                        f"{parts[i][1]} points failed ({parts[i][2]})"), stacklevel=2)
    return [p[0] for p in parts]
