"""flapline: unsteady blade-element aerodynamics of flapping and morphing wings, from Python.

Every function takes a config — a path to a YAML file, or a dict with the YAML's structure — and
optional ``overrides``, a dict of key path -> value with the command line's ``--set`` semantics
(``{"gait.frequency": 30, "flight.velocity.0": 5}``). Results come back as dicts and NumPy arrays
at full precision. The computing releases the GIL (runs in several Python threads proceed in
parallel); studies stop between cases on Ctrl-C.

These are model estimates, not flight clearance: test a new vehicle on a tether or in a net
first, and follow your local aviation rules and licensed practice.
"""

import json
import math
import os

import numpy as np

from .errors import InputError
from . import _flapline

__version__ = _flapline.__version__
CAUTIONS = _flapline.CAUTIONS

__all__ = ["run", "sweep", "trim", "derivatives", "modes", "RunResult", "InputError",
           "CAUTIONS", "__version__"]


def _plain(value):
    """NumPy scalars and arrays as Python numbers and lists (JSON-serialisable)."""
    if isinstance(value, np.ndarray):
        return value.tolist()
    if isinstance(value, np.generic):
        return value.item()
    raise TypeError(f"{type(value).__name__} is not a config value")


def _yaml_value(value):
    """A Python value as the YAML text of an override (numbers in shortest round-trip form)."""
    if isinstance(value, np.ndarray):
        value = value.tolist()
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, np.integer)):
        return str(int(value))
    if isinstance(value, (float, np.floating)):
        if not math.isfinite(value):
            raise InputError(f"override value {value!r}: must be finite", value=repr(value),
                             allowed="a finite number")
        return repr(float(value))
    if isinstance(value, str):
        return value
    try:
        return json.dumps(value, default=_plain)  # lists and maps: JSON is YAML
    except TypeError as e:
        raise InputError(f"override value {value!r}: {e}", value=repr(value),
                         allowed="numbers, text, booleans, lists and maps") from None


def _source(config, overrides):
    """(YAML text, name in messages, folder for table files, --set strings)."""
    sets = [f"{k}={_yaml_value(v)}" for k, v in (overrides or {}).items()]
    if isinstance(config, dict):
        # JSON is YAML; a table_file in a dict config is relative to the current folder.
        try:
            text = json.dumps(config, default=_plain)
        except TypeError as e:
            raise InputError(f"dict config: {e}", allowed="numbers, text, booleans, lists and maps") from None
        return text, "(dict config)", os.getcwd(), sets
    path = os.fspath(config)
    try:
        with open(path, "r", encoding="utf-8") as f:
            text = f.read()
    except OSError as e:
        raise InputError(f"{path}: the configuration file could not be opened ({e.strerror})",
                         file=path, key="(file)", value=path,
                         allowed="the configuration file could not be opened") from None
    return text, path, os.path.dirname(os.path.abspath(path)), sets


class RunResult:
    """One run: ``summary`` (the dict of summary.json), ``history`` (dict of arrays keyed by the
    columns of history.csv), ``spanwise`` (dict of arrays keyed by the columns of spanwise.csv;
    ``phase`` is NaN and ``cycle_mean`` True in the cycle-mean rows), ``drive`` (dict of arrays
    keyed by the columns of drive.csv: joint rates, torques and power of each wing)."""

    def __init__(self, summary, history, spanwise, drive):
        self.summary = summary
        self.history = history
        self.spanwise = spanwise
        self.drive = drive

    def __repr__(self):
        s = self.summary
        return (f"RunResult({s.get('title', '')!r}, status={s['status']!r}, "
                f"lift_N={s['cycle_mean']['lift_N']:.6g})")


def run(config, overrides=None):
    """Run one case; returns a RunResult. Raises InputError on bad input and ArithmeticError
    when the run blows up."""
    text, name, base, sets = _source(config, overrides)
    summary, history, spanwise, drive = _flapline.run(text, name, base, sets)
    return RunResult(json.loads(summary), dict(history), dict(spanwise), dict(drive))


def _number(cell):
    return float(cell) if cell != "" else math.nan


def sweep(config, vary, design="grid", samples=0, seed=1, overrides=None, threads=0):
    """Run a design of cases (``flapline sweep``). ``vary`` maps key paths to VALUES strings
    (``"20:30:5"``, ``"log:1:10:4"``, ``"1,2,3"``) or to lists of numbers. Returns the table as a
    dict of columns: NumPy arrays for numbers, lists of str for ``status`` and ``message`` (and
    for varied keys whose values are not numbers)."""
    text, name, base, sets = _source(config, overrides)
    specs = []
    for key, values in vary.items():
        if not isinstance(values, str):
            values = ",".join(_yaml_value(v) for v in values)
        specs.append(f"{key}={values}")
    columns, rows = _flapline.sweep(text, name, base, sets, specs, design, int(samples),
                                    int(seed), "", int(threads))
    table = {}
    for j, col in enumerate(columns):
        cells = [r[j] for r in rows]
        if col in ("status", "message"):
            table[col] = cells
            continue
        try:
            table[col] = np.array([_number(c) for c in cells], dtype=float)
        except ValueError:
            table[col] = cells
    return table


def trim(config, free, targets=None, balance=False, overrides=None, tolerance=1e-6, threads=0):
    """Trim (``flapline trim``): ``free`` maps key paths to (low, high) bounds; ``targets`` maps
    summary key paths to values, or ``balance=True`` for steady flight. Returns trim.json as a
    dict (``status`` is 'trimmed', 'not_reachable', 'not_converged' or 'failed')."""
    text, name, base, sets = _source(config, overrides)
    frees = [(k, float(lo), float(hi)) for k, (lo, hi) in free.items()]
    tg = [(k, float(v)) for k, v in (targets or {}).items()]
    return json.loads(_flapline.trim(text, name, base, sets, frees, tg, bool(balance),
                                     float(tolerance), int(threads)))


def derivatives(config, params=(), flight=False, overrides=None, threads=0):
    """Control (and with ``flight=True`` stability) derivatives (``flapline derivatives``).
    Returns derivatives.json as a dict, with ``values`` and ``error_estimates`` as arrays
    (rows: quantities, columns: parameters)."""
    text, name, base, sets = _source(config, overrides)
    d = json.loads(_flapline.derivatives(text, name, base, sets, list(params), bool(flight),
                                         int(threads)))
    for key in ("values", "error_estimates"):
        d[key] = np.array([[math.nan if v is None else v for v in row] for row in d[key]])
    return d


def modes(config, params=(), overrides=None, threads=0):
    """Wing-beat-averaged flight dynamics (``flapline modes``): modes.json as a dict with ``A``
    and ``B`` as arrays."""
    text, name, base, sets = _source(config, overrides)
    m = json.loads(_flapline.modes(text, name, base, sets, list(params), int(threads)))
    m["A"] = np.array(m["A"], dtype=float)
    m["B"] = np.array(m["B"], dtype=float).reshape(8, -1)
    return m
