"""Tests of the machine cycle (workbook.cycle), its design-file table (workbook.cycle_file),
the machine study and its record. Numbers of the bin tipper are "demo scenario" and never
the evidence that a formula is right."""

import math

import pytest

from workbook.circuit import Axis
from workbook.cycle import (
    CycleSpec,
    Step,
    Tank,
    consistent_cycle,
    cooler_needed,
    evaluate_cycle,
    rms_power,
    steady_temperature,
    time_constant,
    warm_up,
)
from workbook.cylinder import Cylinder
from workbook.design import DesignFileError, load_design, loads_design
from workbook.errors import InputError
from workbook.fluid import Oil
from workbook.supply import Pump, ReliefValve, Supply
from workbook.valve import CheckValve, CompensatedFlowValve, CounterbalanceValve

LPM = 1 / 60000
OIL = Oil.from_grade("VG46")
QP = 21.6 * LPM
SUPPLY = Supply(Pump(QP), ReliefValve(160e5, 172e5, QP), 7.5e3, 0.85, QP / 0.93)


def _axes():
    rho = float(OIL.density(313.15))
    lift = Axis(Cylinder(0.080, 0.045, 0.6, 210e5), OIL, SUPPLY,
                CompensatedFlowValve.from_setting(12 * LPM, rho, check=CheckValve(0.5e5)), arrangement="meter-in",
                controlled="retract", holding=CounterbalanceValve(60e5, 3.0, 0.5e5 / LPM), holding_side="cap",
                friction=400.0, tank_pressure=2e5)
    tip = Axis(Cylinder(0.063, 0.036, 0.4, 210e5), OIL, SUPPLY,
               CompensatedFlowValve.from_setting(7 * LPM, rho, check=CheckValve(0.5e5)), arrangement="meter-out",
               controlled="extend", friction=300.0, tank_pressure=2e5)
    return {"lift": lift, "tip": tip}


STEPS = (Step("motion", axis="lift", direction="extend", load=8e3, label="up"),
         Step("motion", axis="tip", direction="extend", load=2e3, label="tip"),
         Step("motion", axis="tip", direction="retract", load=-1e3, label="back"),
         Step("motion", axis="lift", direction="retract", load=3e3, label="down"),
         Step("dwell", 15.0, label="wait"))


def _spec(**kw):
    base = dict(steps=STEPS, cycles_per_hour=40, tank=Tank(0.1, 1.3, 12.0, 60.0), ambient=303.15)
    base.update(kw)
    return CycleSpec(**base)


@pytest.mark.parametrize("idle", ["relief", "unloaded"])
def test_energy_conservation_over_the_cycle(idle):
    """Shaft energy = work on the loads + every heat term, to 1e-6 relative (first law; the
    shaft power p Q / eta_total and the pump loss shaft - p Q are common practice)."""
    res = evaluate_cycle(_axes(), _spec(idle=idle), 323.15)
    assert all(s.unbalanced == 0.0 for s in res.steps)
    shaft = res.energy("shaft")
    assert shaft > 0
    assert abs(shaft - (res.energy("useful") + res.heat_energy)) <= 1e-6 * shaft
    # the steps and the idle rest fill the period exactly (90 s at 40 an hour)
    assert math.isclose(sum(s.duration for s in res.steps), 90.0, rel_tol=1e-12)


def test_closed_valve_dwell_dumps_the_whole_pump_over_the_relief():
    """A dwell against the relief puts p Q into the oil at the full-flow pressure plus the
    return back pressure (relief law, supply module; common practice: all of it is heat)."""
    res = evaluate_cycle(_axes(), _spec(steps=(Step("dwell", 90.0),)), 323.15)
    s = res.steps[0]
    p = 172e5 + 2e5                       # full-flow pressure over a 2 bar tank port
    assert math.isclose(s.p_pump, p, rel_tol=1e-12)
    assert math.isclose(s.heat["relief"] + s.heat["return line"], p * QP, rel_tol=1e-12)
    assert math.isclose(s.heat_total, p * QP / 0.85, rel_tol=1e-12)   # shaft power, all heat


def test_tank_balance_by_hand():
    """Steady temperature and exponential warm-up against the hand calculation of the
    workbook.cycle docstring (lumped balance C dT/dt = H - k A (T - T_amb), from memory):
    H 2 kW, k 12 W/(m2 K), A 2.5 m2, ambient 25 degC -> 91.67 degC; C = 174 kg x 1900 +
    150 kg x 460 = 399.6 kJ/K, tau = 13320 s; after one tau 67.14 degC; cooler for 60 degC
    950 W."""
    tank = Tank(volume=0.2, surface=2.5, heat_transfer=12.0, steel_mass=150.0)
    c = tank.heat_capacity(870.0)
    assert c == pytest.approx(399600.0, rel=1e-12)
    t_ss = steady_temperature(2000.0, 298.15, tank)
    assert t_ss - 273.15 == pytest.approx(91.6667, abs=1e-4)
    tau = time_constant(c, tank)
    assert tau == pytest.approx(13320.0, rel=1e-12)
    assert float(warm_up(tau, 298.15, t_ss, tau)) - 273.15 == pytest.approx(25 + 66.6667 * (1 - math.exp(-1)),
                                                                           abs=1e-3)
    assert float(warm_up(0.0, 298.15, t_ss, tau)) == pytest.approx(298.15)
    assert cooler_needed(2000.0, 298.15, 333.15, tank) == pytest.approx(950.0, rel=1e-12)
    assert cooler_needed(500.0, 298.15, 333.15, tank) == 0.0


def test_rms_of_two_steps_by_hand():
    """RMS of 6 kW for 10 s and 1 kW for 30 s: sqrt((36e6 x 10 + 1e6 x 30) / 40) = 3122.5 W
    (hand calculation; RMS sizing of motors is common practice)."""
    assert rms_power([6000.0, 1000.0], [10.0, 30.0]) == pytest.approx(math.sqrt(9.75e6), rel=1e-12)
    # the same over a 60 s period with 20 s at zero
    assert rms_power([6000.0, 1000.0], [10.0, 30.0], 60.0) == pytest.approx(math.sqrt(390e6 / 60), rel=1e-12)


def test_consistent_temperature_is_a_fixed_point():
    """The iterated temperature reproduces itself: T = T_amb + H(T) / (k A) (tank balance)
    and a larger tank surface gives a lower oil temperature (common practice)."""
    axes = _axes()
    spec = _spec(tank=Tank(0.3, 6.0, 12.0, 150.0), idle="unloaded")
    m = consistent_cycle(axes, spec)
    again = evaluate_cycle(axes, spec, m.steady)
    assert m.steady == pytest.approx(steady_temperature(again.mean_heat, spec.ambient, spec.tank), abs=2e-3)
    bigger = consistent_cycle(axes, _spec(tank=Tank(0.3, 9.0, 12.0, 150.0), idle="unloaded"))
    assert bigger.steady < m.steady


def test_unloading_in_dwells_cuts_the_heat():
    """An unloaded pump in dwells puts p_unload Q into the oil instead of p_relief Q (common
    practice: unloading a fixed pump is the first cure for heat)."""
    axes = _axes()
    a = evaluate_cycle(axes, _spec(), 323.15)
    b = evaluate_cycle(axes, _spec(idle="unloaded"), 323.15)
    assert b.mean_heat < a.mean_heat


# ----------------------------------------------------------------------------- bad input
def test_bad_cycle_values():
    with pytest.raises(InputError, match="steps"):
        _spec(steps=())
    with pytest.raises(InputError, match="cycles_per_hour"):
        _spec(cycles_per_hour=0.0)
    with pytest.raises(InputError, match="duration"):
        Step("dwell", -5.0)
    with pytest.raises(InputError, match=r"steps\[1\]\.axis"):
        evaluate_cycle(_axes(), _spec(steps=(Step("motion", axis="boom", direction="extend"),)), 313.15)
    with pytest.raises(InputError, match="cycles_per_hour"):      # steps longer than the period
        evaluate_cycle(_axes(), _spec(cycles_per_hour=3000), 313.15)


DESIGN = '''
[machine]
name = "T"
[axes.lift.cylinder]
bore = "80 mm"
rod = "45 mm"
[axes.lift.flow_valve]
arrangement = "meter-in"
[cycle]
cycles_per_hour = 30
[[cycle.steps]]
axis = "lift"
motion = "extend"
load = "2 kN"
[[cycle.steps]]
dwell = "20 s"
'''


@pytest.mark.parametrize("old, new, key, line", [
    ('axis = "lift"', 'axis = "boom"', "cycle.steps[1].axis", 12),
    ('dwell = "20 s"', 'dwell = "-20 s"', "cycle.steps[2].dwell", 16),
    ('cycles_per_hour = 30', 'cycles_per_hour = 0', "cycle.cycles_per_hour", 10),
    ('motion = "extend"', 'motion = "up"', "cycle.steps[1].motion", 13),
])
def test_bad_design_file_entries_name_the_key(old, new, key, line):
    with pytest.raises(DesignFileError) as err:
        loads_design(DESIGN.replace(old, new), "t.toml")
    assert err.value.key == key and err.value.line == line
    assert str(err.value).startswith(f"t.toml, line {line}, {key}: got ")


def test_a_cycle_with_no_steps_is_refused():
    text = DESIGN.split("[[cycle.steps]]")[0]
    with pytest.raises(DesignFileError, match="cycle.steps: got a cycle with no steps"):
        loads_design(text, "t.toml")


def test_unknown_cycle_entry_is_refused():
    with pytest.raises(DesignFileError, match="cycle.tank: got an unknown cycle entry"):
        loads_design(DESIGN.replace("cycles_per_hour = 30", 'cycles_per_hour = 30\ntank = "1 L"'), "t.toml")


# ----------------------------------------------------------------------------- machine study and record
def test_demo_machine_record_round_trip_and_recheck(tmp_path):
    """The demo's machine record saves, loads (schema, digest) and re-checks without drift
    (demo scenario; real files)."""
    from workbook.record import load, save
    from workbook.review import evaluate_machine, recheck

    design = load_design("notebooks/designs/bin-tipper.toml")
    record, outcome = evaluate_machine(design)
    assert record.axis == "machine"
    path = save(record, tmp_path / "bin-tipper.machine.json")
    again = load(path)
    assert again == record
    assert recheck(again).ok
    rows = {a["key"]: a for a in outcome.alternatives}
    assert rows["unloading"]["applies"] and rows["unloading"]["heat_kw"] < rows["as drawn"]["heat_kw"]
    ids = {f["rule_id"] for f in outcome.findings}
    assert {"CYC-OIL-TEMP", "CYC-COOLER", "CYC-TANK-SIZE", "CYC-MOTOR-RMS", "CYC-MOTOR-PEAK"} <= ids


def test_evaluate_writes_and_prints_the_machine_verdict(tmp_path, capsys):
    """axisbook evaluate writes <design>.machine.json with its review copy beside the axis
    records and prints the machine verdict; recheck re-runs it (demo scenario)."""
    from workbook.cli import main

    code = main(["evaluate", "notebooks/designs/bin-tipper.toml", "--out", str(tmp_path), "--study", "machine-cycle"])
    out = capsys.readouterr().out
    assert code == 1                                      # the demo's oil runs above 60 degC: a fail
    assert (tmp_path / "bin-tipper.machine.json").exists() and (tmp_path / "bin-tipper.machine.html").exists()
    assert not (tmp_path / "bin-tipper-lift.json").exists()   # --study machine-cycle alone
    assert "Machine cycle: FAIL" in out and "helps most: unloading" in out
    assert main(["recheck", str(tmp_path / "bin-tipper.machine.json")]) == 0


def test_steps_longer_than_the_period_name_the_design_key():
    """A cycle whose steps outlast 3600 / cycles_per_hour is refused at cycle.cycles_per_hour
    in the design file (demo scenario: about 59 s of steps against a 36 s period)."""
    from workbook.review import evaluate_machine

    text = open("notebooks/designs/bin-tipper.toml", encoding="utf-8").read()
    design = loads_design(text.replace("cycles_per_hour = 40", "cycles_per_hour = 100"), "bt.toml")
    with pytest.raises(DesignFileError) as err:
        evaluate_machine(design)
    assert err.value.key == "cycle.cycles_per_hour" and err.value.line is not None
    assert "at most" in err.value.allowed


def test_machine_panel_records_real_files_and_refuses_when_stale(tmp_path):
    """The panel writes the machine record and its review copy (real files), refuses to while
    an entry is refused, and a cooler of the needed duty holds the highest oil temperature
    (thermostatic cooler of workbook.cycle; demo scenario)."""
    from workbook.record import load
    from workbook.ui.machine_panel import open_machine

    panel = open_machine("notebooks/designs/bin-tipper.toml", records_dir=tmp_path)
    need = panel.outcome.results["cooler_needed"]["value"]
    assert panel.controls["cooler_duty"].submit(f"{need * 1.01:.6g} kW")
    assert panel.outcome.results["oil_temperature"]["value"] == pytest.approx(60.0)
    assert not panel.controls["ambient"].submit("500 degC")
    assert panel.stale
    with pytest.raises(InputError, match="out of date"):
        panel.record()
    assert panel.controls["ambient"].submit("30 degC")
    path = panel.record()
    rec = load(path)
    assert rec.axis == "machine" and path.with_suffix(".html").exists()
    assert "Machine verdict:" in panel.summary()


def test_a_runaway_step_is_flagged_not_balanced():
    """An overrunning load on a retract stroke without a holding valve on its cap side runs
    away (no steady state, workbook.circuit): the step keeps the shaft power it does account
    for and says how much it does not (force balance; common practice: never leave an
    overrunning load without a holding valve)."""
    step = Step("motion", axis="tip", direction="retract", load=6e3, label="back, loaded")
    res = evaluate_cycle(_axes(), _spec(steps=(step,)), 323.15)
    first = res.steps[0]
    assert first.regime in ("running away", "sinking")
    assert first.unbalanced != 0.0
    balanced = res.steps[1]                       # the idle rest of the period still balances
    assert balanced.unbalanced == 0.0
