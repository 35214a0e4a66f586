"""A small sweep of the invented hover demo from Python, drawn with matplotlib.

    PYTHONPATH=build/python /usr/bin/python3 tools/examples/python/sweep_figure.py

writes sweep_lift_power.png: mean lift and actuator power against flapping frequency for three
stroke amplitudes (model estimates for an invented wing, not flight clearance).
"""
import os

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402

import flapline  # noqa: E402

here = os.path.dirname(os.path.abspath(__file__))
config = os.path.join(here, "..", "..", "..", "configs", "hover_insect.yaml")
table = flapline.sweep(config, {"gait.stroke.amplitude": [50, 60, 70],
                                "gait.frequency": "15:35:9"})
fig, (ax1, ax2) = plt.subplots(1, 2, figsize=(10, 4))
for amplitude in (50.0, 60.0, 70.0):
    pick = table["gait.stroke.amplitude"] == amplitude
    f = table["gait.frequency"][pick]
    ax1.plot(f, 1e3 * table["cycle_mean.lift_N"][pick], "o-", label=f"stroke amplitude {amplitude:g} deg")
    ax2.plot(f, 1e3 * table["power.actuator_mean_W"][pick], "o-")
ax1.set_xlabel("flapping frequency (Hz)")
ax1.set_ylabel("mean lift (mN)")
ax2.set_xlabel("flapping frequency (Hz)")
ax2.set_ylabel("mean actuator power (mW)")
ax1.legend()
fig.suptitle("Invented hover demo: a sweep from Python")
fig.tight_layout()
fig.savefig("sweep_lift_power.png", dpi=100)
print("wrote sweep_lift_power.png;", flapline.CAUTIONS)
