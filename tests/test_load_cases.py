"""Load cases that belong to one motion, the work at the end of a stroke and the stall at every
end stop, on three machines of our own (design files written here, each hand-checked).

* **Press** (vertical, rod down): a 100/70 cylinder lowers a 1.5 t platen on a rod-side
  counterbalance and presses 120 kN at the end of the down (extend) stroke; 30 L/min pump,
  relief 200/210 bar.
* **Log splitter** (horizontal, pushing only): a 100/50 cylinder splits with 100 kN at the end
  of the extend stroke; no overrunning load, no holding valve; every rating 160 bar under a
  200/210 bar relief, so the stall at the work over-pressures the cap side and its line.
* **Clamp**: a 63/36 cylinder clamps 30 kN at the end of its extend stroke on a small pump.

Hand values: areas A = pi d^2 / 4 (100 mm: 78.54 cm2; annulus 100/70: 40.06 cm2; 63 mm:
31.17 cm2); weight m g with g = 9.80665 m/s2 (CGPM 1901, standard gravity); the relief's
settings are over its outlet, so with the whole pump flow the line sits at the full-flow
pressure plus the tank back pressure (force balance on the relief poppet, common practice).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from workbook import checks
from workbook.circuit import axis_from_values
from workbook.design import load_design
from workbook.studies import counterbalance, rod_pressure

BAR = 1e5
G = 9.80665                                          # standard gravity, CGPM 1901

PRESS = """\
[machine]
name = "HP-4 platen press"
revision = "1"

[axes.ram.cylinder]
bore = "100 mm"
rod = "70 mm"
stroke = "500 mm"
rated_pressure = "250 bar"
mounting = "fixed-fixed"
buckling_length = "1200 mm"

[axes.ram.supply]
pump_flow = "30 L/min"
relief_cracking = "200 bar"
relief_full_flow = "210 bar"
drive_power = "15 kW"

[axes.ram.flow_valve]
arrangement = "meter-in"
direction = "extend"
kind = "compensated"
setting = "20 L/min"

[axes.ram.holding]
kind = "counterbalance"
side = "rod"
# 1.5 t on the 40.06 cm2 annulus: 14.71 kN / 40.06 cm2 = 36.7 bar; 1.3 x 36.7 = 47.7 bar
setting = "50 bar"
pilot_ratio = 3

[axes.ram.operation]
loads = []
work_force = "120 kN"
work_motion = "extend"
mass = "1500 kg"
inclination = "-90 deg"
friction = "1 kN"
target_speed = "40 mm/s"
tank_pressure = "2 bar"

[axes.ram.ratings]
hose_rating = "250 bar"
valve_rating = "315 bar"
"""

SPLITTER = """\
[machine]
name = "LS-1 log splitter"

[axes.wedge.cylinder]
bore = "100 mm"
rod = "50 mm"
stroke = "600 mm"
rated_pressure = "160 bar"
mounting = "fixed-fixed"
buckling_length = "1400 mm"

[axes.wedge.supply]
pump_flow = "40 L/min"
relief_cracking = "200 bar"
relief_full_flow = "210 bar"
drive_power = "18.5 kW"

[axes.wedge.flow_valve]
arrangement = "bleed-off"
direction = "extend"
kind = "compensated"
setting = "10 L/min"

[axes.wedge.holding]
kind = "none"

[axes.wedge.operation]
loads = ["0 kN"]
work_force = "100 kN"
friction = "1 kN"
target_speed = "60 mm/s"
speed_tolerance = "25 %"
tank_pressure = "2 bar"

[axes.wedge.ratings]
hose_rating = "160 bar"
valve_rating = "160 bar"
"""

CLAMP = """\
[machine]
name = "CL-2 fixture clamp"

[axes.jaw.cylinder]
bore = "63 mm"
rod = "36 mm"
stroke = "50 mm"
rated_pressure = "160 bar"

[axes.jaw.supply]
pump_flow = "6 L/min"
relief_cracking = "{crack} bar"
relief_full_flow = "{full} bar"
drive_power = "2.2 kW"

[axes.jaw.flow_valve]
arrangement = "meter-in"
direction = "extend"
kind = "compensated"
setting = "4 L/min"

[axes.jaw.holding]
kind = "none"

[axes.jaw.operation]
loads = ["1 kN"]
work_force = "30 kN"
friction = "0.3 kN"
target_speed = "20 mm/s"
speed_tolerance = "25 %"
tank_pressure = "0 bar"

[axes.jaw.ratings]
hose_rating = "250 bar"
valve_rating = "250 bar"
"""


def _axis(tmp_path, text, key):
    path = tmp_path / f"{key}.toml"
    path.write_text(text, encoding="utf-8")
    design = load_design(path)
    values = design.axes[key].values
    return values, axis_from_values(values)


def _by_id(axis):
    return {f.rule_id: f for f in checks.evaluate(axis)}


def test_press_loads_belong_to_their_motion(tmp_path):
    values, ax = _axis(tmp_path, PRESS, "ram")
    weight = 1500 * G                                                   # 14.71 kN, pulling the rod out
    assert ax.loads_for("extend") == pytest.approx((-weight,))
    assert ax.loads_for("retract") == pytest.approx((-weight,))
    found = _by_id(ax)
    # the pressing force is no load case: raising the platen lifts only its weight, so nothing
    # runs away and the rod side is never asked for less than the cavitation limit
    assert found["RUNAWAY"].level == "pass", found["RUNAWAY"].detail
    assert found["CAV-ROD"].level == "pass" and found["CAV-CAP"].level == "pass"
    # the work: stalled extending, cap at 210 + 2 bar, rod side at tank (the counterbalance is
    # piloted open): 212e5 x 78.54e-4 - 2e5 x 40.06e-4 = 165.7 kN against 120 kN
    a1, a3 = math.pi * 0.1 ** 2 / 4, math.pi * (0.1 ** 2 - 0.07 ** 2) / 4
    work = found["WORK-FORCE"]
    assert work.value == pytest.approx(212 * BAR * a1 - 2 * BAR * a3, rel=1e-6)
    assert work.limit == pytest.approx(120e3) and work.level == "pass"
    # the ratings see the stall: 212 bar in the cap chamber, within 250 bar (a caution band of 10 %)
    cap = found["P-CAP-RATING"]
    assert cap.value == pytest.approx(212 * BAR, rel=1e-6) and "stalled" in cap.detail


def test_press_counterbalance_compares_pilot_ratios_on_the_lowering_case(tmp_path):
    values, ax = _axis(tmp_path, PRESS, "ram")
    out = counterbalance.run(values)
    # holding pressure: the platen alone, 14.71 kN / 40.06 cm2 = 36.7 bar (not the pressing force)
    a3 = math.pi * (0.1 ** 2 - 0.07 ** 2) / 4
    assert out.results["load_pressure_max"]["value"] == pytest.approx(1500 * G / a3 / BAR, rel=1e-6)
    # lowering on a 50 bar valve piloted 3:1 needs a pilot of a few bar, never the 136 bar of a
    # pressing case: p_pilot ~ (setting - p_load) / R = (50 - 36.7) / 3 = 4.4 bar plus flow terms
    pilot = out.figures["pilot_pressure"]["series"] if "pilot_pressure" in out.figures else \
        next(f for f in out.figures.values() if "ilot" in f["title"])["series"]
    highest = {}
    for name, series in pilot.items():
        finite = [v for v in series if v is not None and np.isfinite(v)]
        if finite:
            highest[name] = max(finite)
    assert len(highest) == 4 and all(1.0 < p < 15.0 for p in highest.values()), highest
    # the heat finding says where the heat arises, not which ratio to blame
    heat = next(f for f in out.findings if f["rule_id"] == "CB-HEAT")
    assert "ratio stays" not in heat["statement"]
    assert all(word in heat["detail"] for word in ("relief", "flow valve", "counterbalance", "return line"))


def test_splitter_stall_at_the_work_breaks_the_160_bar_ratings(tmp_path):
    values, ax = _axis(tmp_path, SPLITTER, "wedge")
    found = _by_id(ax)
    # stalled on the log the bleed valve still passes its 10 L/min and the relief the other
    # 30 L/min, on its linear override: 2 + 200 + 10 x 30/40 = 209.5 bar in the cap chamber and
    # its line, over the 160 bar ratings (the motion itself needs far less); the compensator's
    # 2 % droop moves the bleed flow a little (rel 2e-3). Retracting onto its stop the bleed
    # valve is out of the line (it tees off the extend line), so the rod side and every line
    # reach the full 210 + 2 = 212 bar
    for rule, bar in (("P-CAP-RATING", 209.5), ("P-HOSE-RATING", 212.0), ("P-VALVE-RATING", 212.0)):
        f = found[rule]
        assert f.level == "fail", (rule, f.value / BAR, f.detail)
        assert f.value == pytest.approx(bar * BAR, rel=2e-3) and "stalled" in f.detail, (rule, f.detail)
    # 100 kN needs (100e3 + 2e5 x 58.90e-4) / 78.54e-4 = 128.8 bar: the 212 bar stall provides it
    assert found["WORK-FORCE"].level == "pass"
    p, why = rod_pressure.working_pressure(ax)
    a1, a3 = math.pi * 0.1 ** 2 / 4, math.pi * (0.1 ** 2 - 0.05 ** 2) / 4
    assert p == pytest.approx((100e3 + 2 * BAR * a3) / a1, rel=1e-12) and "work force" in why


@pytest.mark.parametrize("crack, full, level", [(100, 110, "pass"), (80, 90, "fail")])
def test_clamp_work_force_against_the_relief(tmp_path, crack, full, level):
    # 63 mm bore: A1 = 31.17 cm2; 110 bar gives 34.29 kN (passes 30 kN, margin 14 %),
    # 90 bar gives 28.06 kN (fails); no tank back pressure
    values, ax = _axis(tmp_path, CLAMP.format(crack=crack, full=full), "jaw")
    f = _by_id(ax)["WORK-FORCE"]
    a1 = math.pi * 0.063 ** 2 / 4
    assert f.value == pytest.approx(full * BAR * a1, rel=1e-6)
    assert f.level == level


def test_a_remedy_that_would_stall_the_press_is_not_offered(tmp_path):
    # meter-out on the down stroke: with the valve closed the rod side intensifies,
    # (212e5 x 78.54e-4 + 14.71e3) / 40.06e-4 = 452 bar; keeping it within 250 bar would need a
    # relief of at most (250e5 x 40.06e-4 - 14.71e3) / 78.54e-4 = 108.8 bar, below the
    # (120e3 + 2e5 x 40.06e-4) / 78.54e-4 = 153.8 bar the 120 kN press needs
    text = PRESS.replace('arrangement = "meter-in"', 'arrangement = "meter-out"').replace(
        'setting = "20 L/min"', 'setting = "10 L/min"')
    values, ax = _axis(tmp_path, text, "ram")
    out = rod_pressure.run(values)
    remedy = next(f for f in out.findings if f["rule_id"] == "RP-REMEDY")
    assert "lowering the relief would not do" in remedy["statement"]
    assert "lower the relief full-flow pressure to at most" not in remedy["statement"]
    assert "154 bar for the 120 kN work force extending" in remedy["statement"]


def test_the_return_stroke_speed_is_reported(tmp_path):
    from workbook.studies import axis_check
    values, ax = _axis(tmp_path, PRESS, "ram")
    res = axis_check.run(values).results
    # raising the platen: the whole 30 L/min into the 40.06 cm2 annulus, 0.5e-3 / 40.06e-4 = 124.8 mm/s
    a3 = math.pi * (0.1 ** 2 - 0.07 ** 2) / 4
    assert res["other_speed_max"]["value"] == pytest.approx(30 / 6e4 / a3 * 1e3, rel=1e-6)
    assert "retract" in res["other_speed_max"]["label"]
