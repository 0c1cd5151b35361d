"""The motion study and the design file's motion section: bad input named, defaults when the
section is missing, the directional valve's reduced law equal to the restrictor's, and the
counterbalance's stability against a linear argument derived by hand."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from scipy.optimize import fsolve

from workbook.circuit import axis_from_values
from workbook.design import load_design, loads_design
from workbook.errors import InputError
from workbook.restrictor import SharpOrifice
from workbook.studies import motion
from workbook.transient import Move, initial_state, model_from_values, parse_profile, simulate

DEMO = "notebooks/designs/bin-tipper.toml"


def _lift_values():
    return load_design(DEMO).axes["lift"].values


def test_profile_text_and_bad_input_name_the_field():
    """Moves as written; each refusal an InputError naming its motion field (DEVELOPERS.md, Bad input)."""
    moves = parse_profile("extend to 800 mm; stop 0.2 s; retract for 1.5 s", 1.2)
    assert [(m.kind, m.target, m.duration) for m in moves] == [("extend", 0.8, None), ("stop", None, 0.2),
                                                                ("retract", None, 1.5)]
    for text in ("jump 2 s", "extend to 2000 mm", "stop", "extend to fast"):
        with pytest.raises(InputError) as e:
            parse_profile(text, 1.2)
        assert e.value.field == "motion.profile"
    with pytest.raises(InputError) as e:
        parse_profile("", 1.2, ramp_open=0.0)
    assert e.value.field == "motion.ramp_open"
    values = _lift_values()
    values["motion"]["load_positions"] = [0.0, 0.8, 0.4]
    values["motion"]["load_forces"] = [1e3, 2e3, 3e3]
    with pytest.raises(InputError) as e:
        model_from_values(values)
    assert e.value.field == "motion.load_table"
    values["motion"]["load_forces"] = None
    with pytest.raises(InputError) as e:
        model_from_values(values)
    assert e.value.field == "motion.load_forces"
    values = _lift_values()
    values["operation"]["mass"] = 0.0
    with pytest.raises(InputError) as e:
        motion.run(values)
    assert e.value.field == "operation.mass"


def test_design_without_motion_section_takes_the_defaults():
    """A design file without [axes.<axis>.motion] evaluates on the catalogue's defaults: one
    full stroke out and back with the highest load case all along."""
    d = loads_design('[machine]\nname = "x"\n[axes.a.cylinder]\nstroke = "300 mm"\n', "x.toml")
    values = d.axes["a"].values
    assert values["motion"]["profile"] == "" and values["motion"]["ramp_open"] == pytest.approx(0.1)
    model, profile = model_from_values(values)
    assert [m.kind for m in profile] == ["extend", "stop", "retract", "stop"]
    assert profile[0].target == pytest.approx(0.3) and profile[2].target == 0.0
    assert model.load(0.15) == pytest.approx(10e3)          # the highest default load case, 10 kN


def test_directional_valve_law_is_the_restrictor_law():
    """The directional valve's two-branch form at the oil state equals SharpOrifice.flow (the
    Cd(Re) law of Merritt, Hydraulic Control Systems) over ten decades of drop, both signs."""
    m, _ = model_from_values(_lift_values())
    dp = np.r_[-np.logspace(-3, 7, 41), np.logspace(-3, 7, 41)]
    p = np.zeros((m.n_p, dp.size))
    p[0] = 0.0
    cap = m.side["cap"]["port"]
    p[cap] = -dp                                            # extend: ps (0) -> cap port, drop = dp
    want = SharpOrifice(float(m.dv.diameter)).flow(dp, m.rho, m.mu).flow
    # the directional valve's part of the cap port's net flow: open minus closed
    got = m.flows(p, np.zeros(dp.size), 1.0)[cap] - m.flows(p, np.zeros(dp.size), 0.0)[cap]
    assert np.allclose(got, want, rtol=1e-12, atol=0.0)


def _linear_matrix(e1, v1, e3, v3, a1, a3, mass, ratio, gradient, lag):
    """Lowering on a vented counterbalance on the cap side, a constant flow metered into the
    rod side (a pressure-compensated valve above its minimum drop), outlet at tank. States
    (δp1, δp3, δw, δpp), w the lowering speed, pp the lagged pilot. Continuity with
    compressibility (Merritt, Hydraulic Control Systems) and the valve law
    Q = (p1 + R pp - p_set)/g in its metering range give, linearised by hand::

        dδp1/dt = E1/V1 (A1 δw - (δp1 + R δpp)/g)
        dδp3/dt = -E3/V3 A3 δw                      (Q_in constant)
        dδw/dt  = (-A1 δp1 + A3 δp3)/m               (friction constant while moving)
        dδpp/dt = (δp3 - δpp)/τ

    The lowering is stable exactly when every eigenvalue of this matrix has a negative real
    part. With τ -> 0 the pilot adds R/g E1/V1 δp3 directly, a feedback through the rod
    column's integrator that destabilises the mass on its cap spring as R grows; a long τ
    filters it off at the natural frequency (from this matrix; common practice agrees that
    high ratios hunt more readily with a mass load)."""
    k1, k3 = e1 / v1, e3 / v3
    return np.array([
        [-k1 / gradient, 0.0, k1 * a1, -k1 * ratio / gradient],
        [0.0, 0.0, -k3 * a3, 0.0],
        [-a1 / mass, a3 / mass, 0.0, 0.0],
        [0.0, 1.0 / lag, 0.0, -1.0 / lag],
    ])


def _steady(model, x, u):
    """The steady lowering state of the model at ``x``: circuit.solve's pressures and speed as
    the first guess, then the model's own right-hand side brought to zero (x held)."""
    from workbook.circuit import solve

    s = solve(model.axis, model.load(x), model.axis.temp_min, "retract")
    idx = [i for i in range(model.n) if i != model.i_x]
    y0 = initial_state(model, x)
    y0[model.i_v] = -float(s.speed)
    guess = {"ps": s.p_pump, "p1": s.p1, "p3": s.p3, "cap line": s.p_mid, "rod port": s.p_pump,
             "rod line": s.p3, "cap port": s.p_mid}
    for i, name in enumerate(model.names):
        y0[i] = float(guess.get(name, y0[i]))
    y0[model.i_pp] = y0[model.i3]
    scale = np.ones(len(idx))
    scale[:model.n_p] = 1e-9
    z = fsolve(lambda z: model.rhs(0.0, np.insert(z, model.i_x, x), u)[idx] * scale, np.delete(y0, model.i_x),
               xtol=1e-13)
    y = np.insert(z, model.i_x, x)
    assert np.max(np.abs(model.rhs(0.0, y, u)[idx] * scale)) < 1e-6
    return y


@pytest.mark.parametrize("ratio,lag,stable", [(8.0, 0.001, False), (2.0, 0.1, True)])
def test_counterbalance_stability_matches_linear_argument(ratio, lag, stable):
    """The demo lift lowering 9 kN on a vented counterbalance: the hand-derived linear matrix
    (_linear_matrix) calls ``ratio``/``lag`` stable or not; a 2 mm/s disturbance of the
    steady lowering then decays (stable) or grows (unstable) in the simulation."""
    values = _lift_values()
    axis = axis_from_values(values)
    cb = dataclasses.replace(axis.holding, pilot_ratio=ratio, spring_chamber="vented")
    axis = dataclasses.replace(axis, holding=cb)
    model, _ = model_from_values(values, axis, holding_lag=lag)
    x = 0.6
    u = lambda t: -1.0          # noqa: E731  (lowering: retract, valve fully open)
    y = _steady(model, x, u)
    assert y[model.i_v] == pytest.approx(-0.0817, rel=0.02)   # the compensated setting over A3
    c = model.cyl
    e = model.moduli(y[:model.n_p], x)
    vol = model.volumes(x)
    A = _linear_matrix(e[model.i1], vol[model.i1], e[model.i3], vol[model.i3], c.a1, c.a3, model.m, ratio,
                       cb.gradient, lag)
    scale = np.diag([1e5, 1e5, 1.0, 1e5])                    # bar and m/s: a well-conditioned matrix
    growth = float(np.max(np.linalg.eigvals(np.linalg.solve(scale, A @ scale)).real))
    assert (growth < 0) == stable
    y0 = y.copy()
    y0[model.i_v] -= 0.002
    tr = simulate(model, [Move("retract", duration=0.6, ramp=1e-3)], x0=x, y0=y0, rtol=1e-6, atol_p=1.0,
                  max_step=2e-3)
    dv = np.abs(tr.v - y[model.i_v])
    early = dv[tr.t <= 0.1].max()
    late = dv[tr.t >= 0.5].max()
    assert (late < 0.5 * early) == stable


def test_motion_study_on_the_demo_tip():
    """The demo tip (over-centre load table): every finding carries its source; the retract
    stroke runs into the end stop faster than the 0.1 m/s limit (free retraction under a load
    that pushes the rod in); the stroke time of the metered extension passes."""
    out = motion.run(load_design(DEMO).axes["tip"].values)
    assert out.findings and all(f["source"] for f in out.findings)
    by = {f["rule_id"]: f for f in out.findings}
    assert by["MO-IMPACT"]["level"] == "fail" and by["MO-IMPACT"]["value"] > 100.0
    assert by["MO-TIME-1"]["level"] == "pass"
    assert {"position_vs_time", "speed_vs_time", "pressures_vs_time", "pilot_vs_time"} <= set(out.figures)
    study = out.to_study()
    assert all(len(f["x"]) <= 121 for f in study.figures.values())
