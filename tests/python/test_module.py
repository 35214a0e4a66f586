"""The Python module against the command line (the same C++ underneath, so results agree bit for
bit where the CLI writes full precision), plus its own API: dict configs, overrides, errors,
threads, studies. Run by ctest with Debian's python3 (see tests/CMakeLists.txt)."""

import csv
import json
import math
import os
import subprocess
import threading

import numpy as np
import pytest

import flapline

SOURCE = os.environ["FLAPLINE_SOURCE_DIR"]
CLI = os.environ["FLAPLINE_CLI"]
DEMOS = ["hover_insect", "forward_bat", "rolling_bat", "sizing_insect", "hover_inflow"]
MODELS = ["quasi_steady", "wagner", "lifting_line"]


def config(name):
    return os.path.join(SOURCE, "configs", name + ".yaml")


def cli_run(tmp_path, cfg, sets):
    out = tmp_path / "out"
    args = [CLI, "run", cfg, "-o", str(out), "--no-plot", "--quiet"]
    for s in sets:
        args += ["--set", s]
    subprocess.run(args, check=True)
    with open(out / "summary.json") as f:
        summary = json.load(f)
    with open(out / "history.csv") as f:
        rows = list(csv.reader(f))
    return summary, rows


@pytest.mark.parametrize("demo", DEMOS)
@pytest.mark.parametrize("model", MODELS)
def test_run_equals_the_cli(tmp_path, demo, model):
    r = flapline.run(config(demo), {"model.kind": model, "wing.strips": 8})
    summary, rows = cli_run(tmp_path, config(demo), [f"model.kind={model}", "wing.strips=8"])
    summary.pop("config")  # the CLI names the file it read
    assert r.summary == summary  # the same serializer, full precision
    header, body = rows[0], rows[1:]
    assert list(r.history) == header
    for j, name in enumerate(header):
        cli = np.array([float(row[j]) for row in body])
        # history.csv prints 9 significant digits (phase: 6 decimals).
        tol = 1e-6 if name == "phase" else 0.0
        assert np.allclose(r.history[name], cli, rtol=1e-8, atol=tol + 1e-300), name
    assert r.spanwise["lift_per_span_N_m"].shape == r.spanwise["Z_per_span_N_m"].shape
    with open(tmp_path / "out" / "drive.csv") as f:
        drive_rows = list(csv.reader(f))
    assert list(r.drive) == drive_rows[0]
    power = np.array([float(row[drive_rows[0].index("pair_power_W")]) for row in drive_rows[1:]])
    assert np.allclose(r.drive["pair_power_W"], power, rtol=1e-8, atol=1e-300)


def test_dict_config_equals_file_config(tmp_path):
    cfg = {
        "title": "invented rectangular wing (test)",
        "wing": {"planform": "rectangular", "span": 0.05, "chord": 0.015, "strips": 6},
        "gait": {"frequency": 25,
                 "stroke": {"shape": "harmonic", "amplitude": 60},
                 "pitch": {"shape": "harmonic", "mean": 90, "amplitude": 45, "phase": -90}},
        "model": {"kind": "wagner"},
    }
    path = tmp_path / "case.yaml"
    path.write_text(json.dumps(cfg))  # JSON is YAML
    a = flapline.run(cfg)
    b = flapline.run(path)
    assert a.summary == b.summary
    for k in a.history:
        assert np.array_equal(a.history[k], b.history[k])


def test_overrides_equal_set(tmp_path):
    r = flapline.run(config("hover_insect"), {"gait.frequency": 30.5, "wing.hinge": [0, 0.01, 0]})
    summary, _ = cli_run(tmp_path, config("hover_insect"),
                         ["gait.frequency=30.5", "wing.hinge=[0, 0.01, 0]"])
    summary.pop("config")
    assert r.summary == summary


def test_errors_carry_their_attributes():
    with pytest.raises(flapline.InputError) as info:
        flapline.run(config("hover_insect"), {"gait.frequency": -1})
    e = info.value
    assert isinstance(e, ValueError)
    assert e.key == "gait.frequency"
    assert e.value == "-1"
    assert "(0, 2000]" in e.allowed
    assert "--set" in e.file
    assert "gait.frequency" in str(e)
    with pytest.raises(flapline.InputError) as info:
        flapline.run({"wing": {"planform": "rectangular", "span": 0.05, "chord": 0.01},
                      "gait": {"frequency": 20}, "model": {"kindd": "wagner"}})
    assert info.value.key == "model.kindd"
    assert "did you mean" in str(info.value)
    with pytest.raises(flapline.InputError):
        flapline.run(os.path.join(SOURCE, "configs", "no_such_file.yaml"))


def test_two_threads_at_once_give_the_serial_results():
    args = [(config("forward_bat"), {"model.kind": "lifting_line", "wing.strips": 10}),
            (config("hover_insect"), {"model.kind": "wagner", "wing.strips": 10})]
    serial = [flapline.run(*a).summary for a in args]
    results = [None, None]

    def work(i):
        results[i] = flapline.run(*args[i]).summary

    threads = [threading.Thread(target=work, args=(i,)) for i in range(2)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    assert results == serial


def test_sweep_table_as_arrays():
    t = flapline.sweep(config("hover_insect"), {"gait.frequency": "20:30:3"},
                       overrides={"wing.strips": 6})
    assert t["status"] == ["converged"] * 3
    f = t["gait.frequency"]
    lift = t["cycle_mean.lift_N"]
    assert list(f) == [20.0, 25.0, 30.0]
    # analytic: quasi-steady hover lift scales with f².
    assert lift[2] / lift[0] == pytest.approx((30 / 20) ** 2, rel=1e-12)


def test_trim_derivatives_modes():
    t = flapline.trim(config("hover_vehicle"), {"gait.frequency": (15, 40)}, balance=True,
                      overrides={"wing.strips": 6})
    assert t["status"] == "trimmed"
    d = flapline.derivatives(config("hover_insect"), ["gait.frequency"],
                             overrides={"wing.strips": 6})
    z = d["values"][2, 0]
    assert d["quantities"][2] == "cycle_mean.Z_N"
    assert z < 0
    m = flapline.modes(config("hover_vehicle"), overrides={"wing.strips": 6})
    assert m["A"].shape == (8, 8)
    assert len(m["modes"]) >= 4
