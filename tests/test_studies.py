"""The study cores against hand calculations (laws named beside each check)."""

import copy
import math
from pathlib import Path

import pytest

from workbook.circuit import axis_from_values, solve
from workbook.cylinder import ISO3320_RODS_MM
from workbook.design import load_design
from workbook.errors import InputError
from workbook.studies import counterbalance, rod_pressure, sizing, speed

DESIGN = Path(__file__).resolve().parents[1] / "notebooks" / "designs" / "bin-tipper.toml"
BAR = 1e5


def demo(axis):
    return copy.deepcopy(load_design(DESIGN).axes[axis].values)


def test_sizing_orifice_by_the_orifice_equation():
    """Orifice equation (Merritt 1967): Q = Cd A sqrt(2 dp / rho), turbulent Cd = 0.61.
    For 12 L/min at 20 bar and rho(40 degC) the bore is d = sqrt(4 Q / (pi Cd sqrt(2 dp/rho)))."""
    v = demo("lift")
    v["study"].update(target_flow=12 / 60000, available_drop=20 * BAR, design_temp=313.15)
    out = sizing.run(v)
    rho = 870.0 / (1 + 7e-4 * 25)     # density model: rho15 / (1 + alpha (T - 15 degC))
    d = math.sqrt(4 * 2e-4 / (math.pi * 0.61 * math.sqrt(2 * 20e5 / rho)))
    assert out.results["orifice_exact"]["value"] == pytest.approx(d * 1e3, rel=1e-9)
    drill = out.results["orifice_drill"]["value"] / 1e3
    q_drill = 0.61 * math.pi * drill ** 2 / 4 * math.sqrt(2 * 20e5 / rho) * 60000
    assert out.results["orifice_drill_flow"]["value"] == pytest.approx(q_drill, rel=1e-9)
    # common practice: a turbulent orifice barely notices the oil temperature, a laminar throttle does
    assert out.results["orifice_spread"]["value"] < 3.0
    assert out.results["throttle_spread"]["value"] > 5 * out.results["orifice_spread"]["value"]


def test_speed_candidates_share_one_operating_point():
    """Continuity: the compensated setting for a target speed is v A of the chamber the valve
    serves (lift: meter-in to the rod side, A3); the orifice sized at the compensated valve's
    solved drop passes the same flow there (orifice equation, turbulent)."""
    v = demo("lift")
    axes, res = speed.candidates(v)
    c = axes["orifice"].cylinder
    assert res["compensated_setting"]["value"] == pytest.approx(0.080 * c.a3 * 60000, rel=1e-12)
    dp = res["reference_drop"]["value"] * BAR
    rho = float(axes["orifice"].oil.density(313.15))
    # the compensated valve's flow at that drop, by its droop definition (common practice; the
    # design's droop 2 % per 100 bar above its 8 bar minimum drop): q = Q_set (1 + droop
    # (dp - dp_min) / 100 bar), Q_set = v A3 -- not the solver's flow
    fv = v["flow_valve"]
    q = 0.080 * c.a3 * (1 + fv["droop"] * (dp - fv["min_drop"]) / (100 * BAR))
    d = math.sqrt(4 * q / (math.pi * 0.61 * math.sqrt(2 * dp / rho)))
    assert res["orifice_bore"]["value"] == pytest.approx(d * 1e3, rel=1e-6)
    # the reference load is a real load case (the middle one)
    assert min(abs(res["reference_load"]["value"] * 1e3 - f) for f in axes["orifice"].loads) < 1e-6


def test_rod_pressure_closed_meter_out_and_its_remedies():
    """Force balance with the meter-out valve closed (common practice):
    p3 = (p_full A1 - F) / A3, worst at the most pulling load case. Lowering the relief to
    p <= (rating A3 + F_min)/A1 brings it back inside the rating; the largest safe ISO 3320
    rod satisfies (p A1 - F_min)/A3 <= rating while the next larger rod does not."""
    v = demo("tip")
    out = rod_pressure.run(v)
    ax = axis_from_values(v)
    c = ax.cylinder
    f_min = min(ax.loads)
    p3 = ((172 * BAR + ax.tank_pressure) * c.a1 - f_min) / c.a3     # the relief drains to the tank port
    assert out.results["p_extend_valve_closed_rod"]["value"] == pytest.approx(p3 / BAR, rel=1e-9)
    assert out.results["relief_for_rating"]["value"] == pytest.approx((210 * BAR * c.a3 + f_min) / c.a1 / BAR)
    rod = out.results["largest_safe_rod"]["value"] / 1e3
    a3 = lambda d: math.pi * (c.bore ** 2 - d ** 2) / 4  # noqa: E731
    assert (172 * BAR * c.a1 - f_min) / a3(rod) <= 210 * BAR
    bigger = min(r / 1e3 for r in ISO3320_RODS_MM if r / 1e3 > rod)
    assert (172 * BAR * c.a1 - f_min) / a3(bigger) > 210 * BAR
    remedy = next(f for f in out.findings if f["rule_id"] == "RP-REMEDY")
    assert remedy["level"] == "fail" and "would not do" in remedy["statement"]


def test_counterbalance_pilot_to_lower_matches_the_solver():
    """Lowering against a counterbalance on the cap side (lift axis, retracting):
    opening of an outlet-referenced valve (p1 - p_t) + R (p3 - p_t) = p_set + g Q and force
    balance p1 A1 - p3 A3 = F - F_fr give p3 = (p_set + g Q + (1 + R) p_t - p_L) / (R + A3/A1)
    with p_L = (F - F_fr)/A1. The flow Q through the counterbalance is not the solver's: the
    compensated valve meters into the rod side by its droop definition (common practice) at the
    solved drop dp, with its orifice set at 40 degC, so at the oil's density rho(T)
    Q_rod = Q_set sqrt(rho40 / rho) (1 + droop (dp - dp_min) / 100 bar) (orifice equation,
    Merritt 1967), and continuity gives the cap outflow Q = Q_rod A1 / A3."""
    v = demo("lift")
    ax = axis_from_values(v)
    c = ax.cylinder
    fv = v["flow_valve"]
    rho40, rho = float(ax.oil.density(313.15)), float(ax.oil.density(ax.temp_min))
    for load in ax.loads:
        sol = solve(ax, load, ax.temp_min, direction="retract")
        dp = float(sol.dp_flow_valve)
        assert dp > fv["min_drop"]            # above its minimum drop: the droop law holds
        q = fv["setting"] * math.sqrt(rho40 / rho) * (1 + fv["droop"] * (dp - fv["min_drop"]) / (100 * BAR)) * c.a1 / c.a3
        assert float(sol.q_holding) == pytest.approx(q, rel=1e-9)
        p_l = (load - ax.friction) / c.a1
        g = ax.holding.gradient
        r = ax.holding.pilot_ratio
        expected = (ax.holding.setting + g * q + (1 + r) * ax.tank_pressure - p_l) / (r + c.a3 / c.a1)
        assert float(sol.p_pilot) == pytest.approx(expected, rel=1e-6)
        # the study's helper is the same formula at Q -> 0 and outlet at 0 bar
        assert counterbalance.pilot_to_lower(ax.holding.setting, p_l, ax.holding.pilot_ratio, c.a3 / c.a1) \
            == pytest.approx((ax.holding.setting - p_l) / (ax.holding.pilot_ratio + c.a3 / c.a1))
    out = counterbalance.run(v)
    # common practice: a higher pilot ratio lowers with less pilot pressure
    pilots = [out.results[f"pilot_{r:g}"]["value"] for r in v["study"]["pilot_ratios"]]
    assert pilots == sorted(pilots, reverse=True)
    # the setting recommendation is the factor times the highest load pressure (common practice)
    assert out.results["recommended_setting"]["value"] == pytest.approx(1.3 * 9e3 / c.a1 / BAR)


def test_a_closed_needle_is_refused_at_its_field():
    v = demo("tip")
    v["flow_valve"].update(kind="needle", turns=0.0)
    # the one error type for bad input (workbook/errors.py), naming the field and what is allowed
    with pytest.raises(InputError, match=r"^flow_valve\.turns: got 0 turn; allowed: an opening above 0 turns") as err:
        rod_pressure.run(v)
    assert err.value.field == "flow_valve.turns"
