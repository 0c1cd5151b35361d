"""The counterbalance study's heat figure and finding grade what the check grades (the whole
axis's heat: valves, relief, return line), and a held point is drawn as held with the heat
the pump then puts over the relief, never as 0 kW (issue 9). Demo values are marked "demo
scenario" and are not the evidence; the evidence is the energy balance of the solver."""

import copy
import dataclasses
from pathlib import Path

import numpy as np
import pytest

from workbook.circuit import HELD, axis_from_values, solve
from workbook.design import load_design
from workbook.studies import counterbalance, speed

DESIGN = Path(__file__).resolve().parents[1] / "notebooks" / "designs" / "bin-tipper.toml"


def demo(axis):
    return copy.deepcopy(load_design(DESIGN).axes[axis].values)   # demo scenario


def _heat_by_energy_balance(ax, sol):
    """The whole axis's heat, W, by the energy balance (first law, steady state, gauge
    pressures): the pump's hydraulic power p_pump Q_pump less the net hydraulic power the
    cylinder takes, (p_in A_in - p_out A_out) v (extending: cap in, rod out; retracting: rod
    in, cap out), which is negative while an overrunning load drives the oil. From the solved
    pressures and speed only, not from the solver's loss terms."""
    c = ax.cylinder
    p_in, a_in, p_out, a_out = (sol.p1, c.a1, sol.p3, c.a3) if sol.direction == "extend" else \
        (sol.p3, c.a3, sol.p1, c.a1)
    return sol.p_pump * ax.supply.flow - (p_in * a_in - p_out * a_out) * sol.speed


def test_heat_figure_is_the_whole_axis_heat_and_held_points_are_named():
    """Lift (demo scenario) with a counterbalance set at 550 bar: at 2:1 lowering needs a pilot of
    (550 - p_L)/(2 + A3/A1) ~ 198 bar, above the relief, so those points are held; their heat
    is the pump's whole flow over the relief, p_relief Q_pump (continuity at the pump: nothing
    reaches the cylinder), about 6 kW, not 0 kW. At 8:1 the same valve lowers."""
    v = demo("lift")
    v["holding"]["setting"] = 550e5
    v["study"]["pilot_ratios"] = [2.0, 8.0]
    v["study"]["points"] = 40
    out = counterbalance.run(v)
    fig = out.figures["heat_vs_load"]
    assert "whole axis" in fig["title"]
    held = np.array(out.regimes["heat_vs_load"]["counterbalance 2:1"]) == HELD
    assert held.any()
    ax = axis_from_values(v)
    q_pump = ax.supply.flow
    p_relief = float(ax.supply.relief.pressure(q_pump, ax.tank_pressure))
    heat = np.asarray(fig["series"]["counterbalance 2:1"])
    assert np.all(heat[held] > 0.9 * p_relief * q_pump / 1e3)
    # at every point the drawn heat is the whole axis's heat by the energy balance (not the
    # solver's own loss figure): the pump's hydraulic power less the power the cylinder takes
    loads = np.asarray(fig["x"]) * 1e3
    cb = dataclasses.replace(ax.holding, pilot_ratio=8.0)
    sol = solve(dataclasses.replace(ax, holding=cb), loads, v["operation"]["temp_min"], direction="retract")
    assert np.allclose(np.asarray(fig["series"]["counterbalance 8:1"]), _heat_by_energy_balance(ax, sol) / 1e3,
                       rtol=1e-9)
    # the finding grades the same quantity, and says where the axis does not lower
    f = next(f for f in out.findings if f["rule_id"] == "CB-HEAT")
    assert "whole axis" in f["detail"]
    assert counterbalance.NORMAL_REGIME is not None        # held points are drawn apart from metering ones


def test_speed_heat_figure_is_the_whole_axis_heat():
    """The speed study's heat figure shows the heat the heat-share check grades: the whole
    axis's loss (valves, relief, return line), against the same limit line (demo scenario)."""
    v = demo("lift")
    v["study"]["points"] = 30
    out = speed.run(v)
    fig = out.figures["losses_vs_load"]
    assert "whole axis" in fig["title"]
    axes, _ = speed.candidates(v)
    sol = solve(axes["compensated valve"], np.asarray(fig["x"]) * 1e3, v["study"]["design_temp"])
    assert np.allclose(np.asarray(fig["series"]["compensated valve"]),
                       _heat_by_energy_balance(axes["compensated valve"], sol) / 1e3, rtol=1e-9)
    assert fig["limits"]["heat share of drive power"] == pytest.approx(
        v["limits"]["heat_share"] * v["supply"]["drive_power"] / 1e3)
