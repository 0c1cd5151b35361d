"""The machine cycle: energy, heat and oil temperature of the axes that share one power unit.

A cycle is a sequence of steps over the axes of one power unit, run one after the other:
a **motion** (an axis extending or retracting against one load) or a **dwell** (no axis
moving; the pump idles against its relief valve, or unloaded at a stated pressure). The
cycle repeats ``cycles_per_hour`` times an hour; whatever time of the period the steps do
not fill is idle time of the same kind as a dwell.

Per step (SI: W, J, s, m³/s, Pa gauge), from the steady solution of the moving axis
(:func:`workbook.circuit.solve`; its own loss terms, never a second copy of a valve law)::

    P_hyd   = p_pump Q_pump                           hydraulic power of the pump
    P_shaft = p_pump Q_pump / eta_total               shaft power (common practice)
    H_pump  = P_shaft - P_hyd                         pump losses, into the oil
              = p (Q_geom - Q_pump)                   of it the leakage (volumetric efficiency)
              + (P_shaft - p Q_geom)                  and the hydromechanical rest
    P_useful = s F v                                  work on the load (negative when it overruns)
    heat     = flow valve + holding valve + relief + return line + cylinder friction + pump

so that, where the solution has a steady state, ``P_shaft = P_useful + sum(heat)``
(energy conservation; the test checks it to 1e-6). A closed valve that dumps the pump
over the relief counts fully: its whole ``p Q`` is relief heat. A dwell against the relief
puts ``p_relief(Q_pump) Q_pump`` into the oil; an unloading valve ``p_unload Q_pump``.

Per cycle, with period ``T = 3600 / cycles_per_hour``::

    E_shaft = sum(P_shaft,i t_i)                      energy per cycle, J
    H_mean  = sum(heat_i t_i) / T                     mean heat into the oil, W
    P_rms   = sqrt(sum(P_shaft,i**2 t_i) / T)         motor thermal sizing (common practice)
    P_peak  = max(P_shaft,i)

Tank balance (lumped; from memory, any fluid-power handbook)::

    C dT/dt = H - k A (T - T_amb) - H_cooler
    T_ss    = T_amb + (H - H_cooler) / (k A)          steady oil temperature
    tau     = C / (k A),   C = m_oil c_oil + m_steel c_steel
    T(t)    = T_ss - (T_ss - T_0) exp(-t / tau)        warm-up from T_0
    H_cooler,needed = H(T_max) - k A (T_max - T_amb)   duty to hold T_max (0 if negative)

The cooler is taken as thermostatic: idle while the oil stays at or below ``T_max``,
otherwise removing up to its installed duty. Viscosity follows the oil temperature, so the
losses are solved again at each new temperature until the temperature is consistent
(fixed-point iteration, :func:`consistent_cycle`).

Worked example of the tank balance (by hand): H = 2.0 kW, k = 12 W/(m² K), A = 2.5 m²,
T_amb = 25 °C: ``T_ss = 25 + 2000 / 30 = 91.67 °C``. 200 L of oil at 870 kg/m³ (174 kg,
1.9 kJ/(kg K): 330.6 kJ/K) and 150 kg of steel (0.46 kJ/(kg K): 69.0 kJ/K) give
C = 399.6 kJ/K and ``tau = 399600 / 30 = 13320 s`` (3.70 h); one time constant after a cold
start the oil is at ``25 + 66.67 (1 - 1/e) = 67.14 °C``; a cooler holding 60 °C must take
``2000 - 30 x 35 = 950 W``.

>>> tank = Tank(volume=0.200, surface=2.5, heat_transfer=12.0, steel_mass=150.0)
>>> c = tank.heat_capacity(870.0)
>>> round(c), round(steady_temperature(2000.0, 298.15, tank) - 273.15, 2)
(399600, 91.67)
>>> round(time_constant(c, tank)), round(float(warm_up(13320.0, 298.15, 364.8167, 13320.0)) - 273.15, 2)
(13320, 67.14)
>>> round(cooler_needed(2000.0, 298.15, 333.15, tank), 6)
950.0

Sources: the energy terms are the steady solution's own; the shaft-power law and RMS
sizing are common practice; the lumped tank balance, the heat capacities (mineral oil about
1.9 kJ/(kg K), steel about 0.46 kJ/(kg K)) and the natural-convection coefficient of a steel
tank in still air (10 to 15 W/(m² K)) are from memory; the oil maker's data and the
power-unit maker decide.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from typing import Mapping, Sequence

import numpy as np

from .circuit import UNCONTROLLED, Axis, solve
from .constants import T0_C
from .errors import InputError
from .formatting import kind_of

#: heat terms of a step, in the order they are reported (where the heat arises)
HEAT_TERMS = ("flow valve", "holding valve", "relief", "unloading valve", "return line", "cylinder friction",
              "pump")
#: idle states of the pump during dwells
IDLE_STATES = ("relief", "unloaded")
#: specific heat of steel, J/(kg K) (from memory; carbon steel 0.45 to 0.50 kJ/(kg K))
STEEL_SPECIFIC_HEAT = 460.0
#: regimes without a steady state: their energy does not balance and is flagged
NO_STEADY_STATE = tuple(UNCONTROLLED)


@dataclass(frozen=True)
class Step:
    """One step of the cycle (SI).

    ``kind`` is ``"motion"`` (``axis`` moves in ``direction`` against ``load``, N, over
    ``stroke`` m, the axis's full stroke when None, in ``duration`` s, from the solved
    speed when None) or ``"dwell"`` (``duration`` s, nothing moves). ``label`` names the
    step for people.
    """

    kind: str
    duration: float | None = None
    axis: str | None = None
    direction: str | None = None
    load: float = 0.0
    stroke: float | None = None
    label: str = ""

    def __post_init__(self):
        if self.kind not in ("motion", "dwell"):
            raise InputError("step kind", repr(self.kind), "'motion' or 'dwell'")
        if self.duration is not None and not (math.isfinite(self.duration) and self.duration > 0):
            raise InputError("duration", self.duration, "a time greater than 0 s")
        if self.kind == "dwell" and self.duration is None:
            raise InputError("duration", "nothing", "the dwell's duration, e.g. 20 s")
        if self.kind == "motion":
            if self.direction not in ("extend", "retract"):
                raise InputError("motion", repr(self.direction), "'extend' or 'retract'")
            if not math.isfinite(self.load):
                raise InputError("load", self.load, "a finite force")
            if self.stroke is not None and not (math.isfinite(self.stroke) and self.stroke > 0):
                raise InputError("stroke", self.stroke, "a length greater than 0 m")


@dataclass(frozen=True)
class Tank:
    """The power unit's tank (SI): oil ``volume`` m³, heat-shedding ``surface`` m² (None:
    estimated as ``5 V^(2/3)``, a cube of the oil volume without its top; common practice,
    from memory), ``heat_transfer`` W/(m² K), ``steel_mass`` kg (None: the estimated
    surface plus a lid at 3 mm of steel, 7850 kg/m³), ``oil_specific_heat`` J/(kg K).

    >>> round(Tank(volume=0.125).surface, 4)   # 5 x 0.125**(2/3) = 5 x 0.25
    1.25
    """

    volume: float
    surface: float | None = None
    heat_transfer: float = 12.0
    steel_mass: float | None = None
    oil_specific_heat: float = 1900.0

    def __post_init__(self):
        for name in ("volume", "heat_transfer", "oil_specific_heat"):
            v = getattr(self, name)
            if not (math.isfinite(v) and v > 0):
                raise InputError(name, v, "a finite value greater than 0")
        if self.surface is None:
            object.__setattr__(self, "surface", 5.0 * self.volume ** (2.0 / 3.0))
        elif not (math.isfinite(self.surface) and self.surface > 0):
            raise InputError("tank_surface", self.surface, "an area greater than 0 m²")
        if self.steel_mass is None:
            object.__setattr__(self, "steel_mass", 1.2 * self.surface * 0.003 * 7850.0)
        elif not (math.isfinite(self.steel_mass) and self.steel_mass >= 0):
            raise InputError("steel_mass", self.steel_mass, "a mass of 0 kg or more")

    @property
    def conductance(self) -> float:
        """``k A``, W/K: heat shed per kelvin above ambient."""
        return self.heat_transfer * self.surface

    def heat_capacity(self, oil_density: float) -> float:
        """``C = rho V c_oil + m_steel c_steel``, J/K (oil density in kg/m³)."""
        return oil_density * self.volume * self.oil_specific_heat + self.steel_mass * STEEL_SPECIFIC_HEAT


def steady_temperature(heat: float, ambient: float, tank: Tank, cooler: float = 0.0) -> float:
    """Steady oil temperature, K: ``T_amb + (H - H_cooler) / (k A)`` (heat and cooler in W)."""
    return ambient + (heat - cooler) / tank.conductance


def time_constant(heat_capacity: float, tank: Tank) -> float:
    """Warm-up time constant ``C / (k A)``, s (heat capacity in J/K)."""
    return heat_capacity / tank.conductance


def warm_up(t, start: float, steady: float, tau: float):
    """Oil temperature, K, at times ``t`` (s) after a start at ``start`` K:
    ``T_ss - (T_ss - T_0) exp(-t / tau)``."""
    return steady - (steady - start) * np.exp(-np.asarray(t, dtype=float) / tau)


def cooler_needed(heat_at_max: float, ambient: float, oil_max: float, tank: Tank) -> float:
    """Cooler duty, W, that holds the oil at ``oil_max`` K: ``max(H - k A (T_max - T_amb), 0)``
    with ``H`` (W) the mean heat at ``T_max``."""
    return max(heat_at_max - tank.conductance * (oil_max - ambient), 0.0)


def held_temperature(heat: float, ambient: float, oil_max: float, tank: Tank, cooler: float) -> float:
    """Steady oil temperature, K, with a thermostatic cooler of ``cooler`` W: the tank alone
    where that stays at or below ``oil_max``; ``oil_max`` where the cooler can hold it;
    otherwise ``T_amb + (H - H_cooler) / (k A)``."""
    alone = steady_temperature(heat, ambient, tank)
    if alone <= oil_max:
        return alone
    if cooler >= cooler_needed(heat, ambient, oil_max, tank):
        return oil_max
    return steady_temperature(heat, ambient, tank, cooler)


# --------------------------------------------------------------------------- cycle inputs
@dataclass(frozen=True)
class CycleSpec:
    """A machine cycle (SI): the steps, cycles per hour, the pump's idle state in dwells
    (``"relief"`` or ``"unloaded"`` at ``unload_pressure`` Pa), the ambient and highest oil
    temperatures (K), the tank, an installed cooler duty (W, 0 for none), the motor's
    allowed short-time overload (peak over rated power) and the smallest tank volume as
    minutes of pump flow (``tank_minutes``; common practice 3 to 5)."""

    steps: tuple
    cycles_per_hour: float
    tank: Tank
    idle: str = "relief"
    unload_pressure: float = 5e5
    ambient: float = 298.15
    oil_max: float = 333.15
    cooler: float = 0.0
    motor_overload: float = 1.25
    tank_minutes: float = 3.0
    start_temperature: float | None = None

    def __post_init__(self):
        steps = tuple(self.steps)
        if not steps:
            raise InputError("steps", "a cycle with no steps", "at least one step")
        object.__setattr__(self, "steps", steps)
        if not (math.isfinite(self.cycles_per_hour) and self.cycles_per_hour > 0):
            raise InputError("cycles_per_hour", self.cycles_per_hour, "a number of cycles greater than 0 an hour")
        if self.idle not in IDLE_STATES:
            raise InputError("idle", repr(self.idle), "one of 'relief', 'unloaded'")
        if self.oil_max <= self.ambient:
            raise InputError("oil_max", f"{self.oil_max - T0_C:g} degC",
                             f"a temperature above the ambient ({self.ambient - T0_C:g} degC)")

    @property
    def period(self) -> float:
        """Time of one cycle, s: ``3600 / cycles_per_hour``."""
        return 3600.0 / self.cycles_per_hour


@dataclass(frozen=True)
class StepResult:
    """One step evaluated (SI): duration s, pump pressure Pa and flow m³/s, shaft, hydraulic
    and useful power W, heat by term W (:data:`HEAT_TERMS`), speed m/s, regime, and
    ``unbalanced`` W: shaft power no steady state accounts for (zero where there is one)."""

    step: Step
    duration: float
    p_pump: float
    q_pump: float
    q_cylinder: float
    shaft: float
    hydraulic: float
    useful: float
    heat: dict
    speed: float
    regime: str
    unbalanced: float = 0.0

    @property
    def heat_total(self) -> float:
        """Sum of the heat terms, W."""
        return float(sum(self.heat.values()))


@dataclass(frozen=True)
class CycleResult:
    """A cycle evaluated at one oil temperature (SI); ``steps`` include the idle rest of the
    period as a last step (label ``"idle rest of the period"``) when there is one."""

    temperature: float
    period: float
    steps: tuple

    def energy(self, what: str) -> float:
        """Energy per cycle, J, of ``"shaft"``, ``"useful"``, ``"hydraulic"`` or a heat term."""
        if what in ("shaft", "useful", "hydraulic", "unbalanced"):
            return float(sum(getattr(s, what) * s.duration for s in self.steps))
        return float(sum(s.heat.get(what, 0.0) * s.duration for s in self.steps))

    @property
    def heat_energy(self) -> float:
        """Heat into the oil per cycle, J."""
        return float(sum(s.heat_total * s.duration for s in self.steps))

    @property
    def mean_heat(self) -> float:
        """``sum(heat_i t_i) / T``, W."""
        return self.heat_energy / self.period

    @property
    def rms_power(self) -> float:
        """``sqrt(sum(P_i**2 t_i) / T)``, W (motor thermal sizing; common practice)."""
        return rms_power([s.shaft for s in self.steps], [s.duration for s in self.steps], self.period)

    @property
    def peak_power(self) -> float:
        """Highest shaft power of any step, W."""
        return max(s.shaft for s in self.steps)

    @property
    def busy_time(self) -> float:
        """Time of the given steps, s (the period without the idle rest)."""
        return float(sum(s.duration for s in self.steps if s.step.label != IDLE_REST))


IDLE_REST = "idle rest of the period"


def rms_power(powers: Sequence[float], durations: Sequence[float], period: float | None = None) -> float:
    """Root-mean-square power, W, of ``powers`` (W) held for ``durations`` (s) over ``period``
    (s; their sum when None): ``sqrt(sum(P_i**2 t_i) / T)``.

    >>> round(rms_power([6000.0, 1000.0], [10.0, 30.0]), 1)    # sqrt((36e6 x 10 + 1e6 x 30) / 40)
    3122.5
    """
    p = np.asarray(powers, dtype=float)
    t = np.asarray(durations, dtype=float)
    total = float(t.sum()) if period is None else float(period)
    return float(math.sqrt(float(np.sum(p * p * t)) / total))


def _pump_heat(supply, p_pump: float) -> dict:
    """Pump losses, W, split into leakage and hydromechanical parts (see the module text)."""
    q = supply.flow
    shaft = float(supply.shaft_power(p_pump))
    hydraulic = p_pump * q
    return {"shaft": shaft, "hydraulic": hydraulic, "pump": shaft - hydraulic}


def evaluate_step(axes: Mapping[str, Axis], step: Step, temperature: float, spec: CycleSpec) -> StepResult:
    """One step at oil temperature ``temperature`` K (see the module text for the terms)."""
    if step.kind == "dwell":
        supply = next(iter(axes.values())).supply
        pt = next(iter(axes.values())).tank_pressure
        return _idle(supply, pt, step, step.duration, spec)
    axis = axes[step.axis]
    sol = solve(axis, step.load, temperature, step.direction)
    speed = float(sol.speed)
    regime = str(sol.regime)
    duration = step.duration
    if duration is None:
        stroke = axis.cylinder.stroke if step.stroke is None else step.stroke
        if speed <= 0.0:
            raise InputError(f"step {step.label or step.axis}", f"an axis that does not move ({regime})",
                             "a step whose axis moves at its load, or a duration given for it")
        duration = stroke / speed
    p_pump = float(sol.p_pump)
    pump = _pump_heat(axis.supply, p_pump)
    heat = {k: 0.0 for k in HEAT_TERMS}
    heat["flow valve"] = float(sol.loss_flow_valve)
    heat["holding valve"] = float(sol.loss_holding)
    heat["relief"] = float(sol.loss_relief)
    heat["return line"] = float(sol.loss_return_line)
    heat["cylinder friction"] = float(sol.friction_power)
    heat["pump"] = pump["pump"]
    useful = float(sol.useful_power)
    unbalanced = pump["shaft"] - useful - sum(heat.values())
    if abs(unbalanced) <= 1e-9 * max(pump["shaft"], 1.0):
        unbalanced = 0.0
    return StepResult(step, float(duration), p_pump, float(sol.q_pump), float(sol.q_cylinder_in), pump["shaft"],
                      pump["hydraulic"], useful, heat, speed, regime, unbalanced)


def _idle(supply, tank_pressure: float, step: Step, duration: float, spec: CycleSpec) -> StepResult:
    q = supply.flow
    heat = {k: 0.0 for k in HEAT_TERMS}
    if spec.idle == "unloaded":
        p = float(spec.unload_pressure)
        heat["unloading valve"] = p * q
        regime = "unloaded"
    else:
        p = float(supply.relief.pressure(q, tank_pressure))
        heat["relief"] = (p - tank_pressure) * q
        heat["return line"] = tank_pressure * q
        regime = "over the relief"
    pump = _pump_heat(supply, p)
    heat["pump"] = pump["pump"]
    return StepResult(step, float(duration), p, q, 0.0, pump["shaft"], pump["hydraulic"], 0.0, heat, 0.0, regime)


def check_machine(axes: Mapping[str, Axis], spec: CycleSpec) -> None:
    """Refuse a cycle whose steps name an unknown axis, or axes that do not share one power unit."""
    for i, step in enumerate(spec.steps, 1):
        if step.kind == "motion" and step.axis not in axes:
            raise InputError(f"steps[{i}].axis", repr(step.axis), "one of the axes: " + ", ".join(axes))
    first = next(iter(axes.values())).supply
    for key, axis in axes.items():
        if axis.supply != first:
            raise InputError(f"axes.{key}.supply", "a power unit other than the first axis's",
                             "axes that share one power unit (give the supply under [defaults.supply])")


def evaluate_cycle(axes: Mapping[str, Axis], spec: CycleSpec, temperature: float) -> CycleResult:
    """Every step of ``spec`` at oil temperature ``temperature`` K, then the idle rest of the
    period. Refused when the steps take longer than the period (``cycles_per_hour``)."""
    check_machine(axes, spec)
    results = [evaluate_step(axes, s, temperature, spec) for s in spec.steps]
    busy = sum(r.duration for r in results)
    period = spec.period
    if busy > period * (1 + 1e-12):
        raise InputError("cycles_per_hour", f"{spec.cycles_per_hour:g} (a period of {period:.4g} s)",
                         f"at most {3600.0 / busy:.4g} cycles an hour: the steps take {busy:.4g} s")
    rest = period - busy
    if rest > 1e-9 * period:
        first = next(iter(axes.values()))
        results.append(_idle(first.supply, first.tank_pressure, Step("dwell", rest, label=IDLE_REST), rest, spec))
    return CycleResult(float(temperature), period, tuple(results))


@dataclass(frozen=True)
class MachineCycle:
    """The cycle at its consistent oil temperature, and the tank's answer (SI)."""

    spec: CycleSpec
    result: CycleResult            # at the consistent steady temperature
    at_max: CycleResult            # at the highest allowed oil temperature (for the cooler duty)
    steady: float                  # K, with the installed cooler
    steady_tank_alone: float       # K, without a cooler (losses at that temperature where valid)
    cooler_needed: float           # W, to hold oil_max
    heat_capacity: float           # J/K
    tau: float                     # s
    iterations: int
    limited: bool = False          # True when the temperature left the oil model's validity
    notes: tuple = field(default_factory=tuple)

    @property
    def tank_needed(self) -> float:
        """Oil volume, m³, whose estimated surface ``5 V^(2/3)`` sheds the mean heat at
        ``oil_max`` without a cooler: ``(H / (5 k dT))^(3/2)``."""
        dt = self.spec.oil_max - self.spec.ambient
        area = self.at_max.mean_heat / (self.spec.tank.heat_transfer * dt)
        return (area / 5.0) ** 1.5


def _valid_range(axes: Mapping[str, Axis]) -> tuple[float, float]:
    lo = max(a.oil.pour_point for a in axes.values())
    hi = min(a.oil.max_temperature for a in axes.values())
    return lo, hi


def consistent_cycle(axes: Mapping[str, Axis], spec: CycleSpec, tol: float = 1e-3, maxiter: int = 60) -> MachineCycle:
    """The cycle at the oil temperature its own losses give (viscosity follows temperature).

    Fixed-point iteration ``T_{n+1} = T_ss(H(T_n))`` with the thermostatic cooler, started at
    ``oil_max`` and relaxed by half where it oscillates, to ``|dT| <= tol`` K. Where the
    steady temperature lies outside the oil model's validity the losses are taken at its
    edge and ``limited`` is set (the answer is then an estimate beyond the model).
    """
    check_machine(axes, spec)
    lo, hi = _valid_range(axes)
    first = next(iter(axes.values()))
    rho = float(first.oil.density(min(max(spec.ambient, lo), hi)))
    cap = spec.tank.heat_capacity(rho)
    tau = time_constant(cap, spec.tank)

    def clamp(t):
        return min(max(t, lo), hi)

    at_max = evaluate_cycle(axes, spec, clamp(spec.oil_max))
    need = cooler_needed(at_max.mean_heat, spec.ambient, spec.oil_max, spec.tank)
    t = clamp(spec.oil_max)
    res = at_max
    n = 0
    relax = 1.0
    last_step = None
    for n in range(1, maxiter + 1):
        target = held_temperature(res.mean_heat, spec.ambient, spec.oil_max, spec.tank, spec.cooler)
        step = target - t
        if abs(step) <= tol:
            break
        if last_step is not None and step * last_step < 0:
            relax = max(relax * 0.5, 0.125)
        last_step = step
        t_new = clamp(t + relax * step)
        if t_new == t:   # pinned at the model's edge
            break
        t = t_new
        res = evaluate_cycle(axes, spec, t)
    steady = held_temperature(res.mean_heat, spec.ambient, spec.oil_max, spec.tank, spec.cooler)
    limited = not (lo <= steady <= hi)
    # without a cooler: the same iteration with no cooler (one pass from the consistent state suffices
    # where no cooler is installed)
    if spec.cooler > 0.0:
        alone_spec = replace(spec, cooler=0.0)
        alone = consistent_cycle(axes, alone_spec, tol, maxiter).steady
    else:
        alone = steady
    return MachineCycle(spec, res, at_max, steady, alone, need, cap, tau, n, limited)


def timeline(result: CycleResult) -> dict:
    """Step edges of one cycle for a figure (SI): ``t`` (s, two points per step so that each
    step is flat), shaft power, heat and useful power (W), and the step index of each point."""
    t, shaft, heat, useful, index = [], [], [], [], []
    now = 0.0
    for i, s in enumerate(result.steps):
        for edge in (now, now + s.duration):
            t.append(edge)
            shaft.append(s.shaft)
            heat.append(s.heat_total)
            useful.append(s.useful)
            index.append(i)
        now += s.duration
    return {"t": t, "shaft": shaft, "heat": heat, "useful": useful, "step": index}


__all__ = ["Step", "Tank", "CycleSpec", "StepResult", "CycleResult", "MachineCycle", "HEAT_TERMS", "IDLE_STATES",
           "IDLE_REST", "STEEL_SPECIFIC_HEAT", "steady_temperature", "time_constant", "warm_up", "cooler_needed",
           "held_temperature", "rms_power", "evaluate_step", "evaluate_cycle", "consistent_cycle", "timeline",
           "check_machine"]


def spec_from_values(values: Mapping, steps: Sequence[Step]) -> CycleSpec:
    """A :class:`CycleSpec` from the SI values of the ``cycle`` section of
    :mod:`workbook.inputs` (keys as declared there) and the steps."""
    tank = Tank(volume=values["tank_volume"], surface=values.get("tank_surface"),
                heat_transfer=values["heat_transfer"], steel_mass=values.get("steel_mass"),
                oil_specific_heat=values["oil_specific_heat"])
    return CycleSpec(tuple(steps), values["cycles_per_hour"], tank, idle=values["idle"],
                     unload_pressure=values["unload_pressure"], ambient=values["ambient"],
                     oil_max=values["oil_max"], cooler=values["cooler_duty"],
                     motor_overload=values["motor_overload"], tank_minutes=values["tank_minutes"])


def step_to_data(step: Step) -> dict:
    """Plain SI data of a step (for records): the fields of :class:`Step`."""
    return {"kind": step.kind, "label": step.label, "axis": step.axis, "direction": step.direction,
            "load": float(step.load), "duration": step.duration, "stroke": step.stroke}


def step_from_data(data: Mapping, where: str = "step") -> Step:
    """A :class:`Step` back from :func:`step_to_data`; refused with the part named."""
    if not isinstance(data, Mapping):
        raise InputError(where, kind_of(data), "a mapping of the step's parts")
    extra = sorted(set(data) - {"kind", "label", "axis", "direction", "load", "duration", "stroke"})
    if extra:
        raise InputError(f"{where}.{extra[0]}", "an unknown part", "kind, label, axis, direction, load, duration, stroke")

    def num(key, none_ok=True):
        v = data.get(key)
        if v is None and none_ok:
            return None
        if isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v):
            raise InputError(f"{where}.{key}", repr(v)[:60], "a finite number (SI)")
        return float(v)

    for key in ("kind", "label"):
        if not isinstance(data.get(key, ""), str):
            raise InputError(f"{where}.{key}", repr(data.get(key))[:60], "text")
    for key in ("axis", "direction"):
        if data.get(key) is not None and not isinstance(data[key], str):
            raise InputError(f"{where}.{key}", repr(data.get(key))[:60], "text or null")
    try:
        return Step(data.get("kind", ""), num("duration"), data.get("axis"), data.get("direction"),
                    num("load", none_ok=False) if "load" in data else 0.0, num("stroke"), data.get("label", ""))
    except InputError as exc:
        raise exc.qualified(f"{where}.{exc.field}") from None


__all__ += ["spec_from_values", "step_to_data", "step_from_data"]
