"""The catalogue: every input of an axis, declared once (see :mod:`workbook.fields`).

Sections, in the order a design file lists them:

``identity``   machine, axis, revision, author, date
``cylinder``   bore, rod, stroke, rated pressure
``oil``        grade, datasheet viscosities, density, expansion, bulk modulus, pour point
``supply``     fixed pump and its relief valve, drive power
``flow_valve`` where the flow is metered and by what
``holding``    load-holding valve on the load-holding side (or none)
``operation``  load cases, friction, oil temperatures, tank back pressure, target speed
``ratings``    hose and valve pressure ratings, line bores
``limits``     the checks' defaults, each with its source, all overridable
``study``      the studies' own settings (target flow and drop, sweep range, pilot ratios)
``motion``     the axis in time: command profile, valve ramps, load table, friction parts, limits

Sources of defaults: ``"common practice"`` (facts of the trade without a citable
source), ``"from memory"`` (a value recalled but not checked against a source at hand),
``"demo scenario"`` (our invented bin tipper), or the standard named.
"""

from __future__ import annotations

from .fields import Field, Section

IDENTITY = Section(
    "identity",
    "Identity",
    (
        Field("machine", "Machine", "text", default="", help="machine name or number"),
        Field("axis", "Axis", "text", default="", help="axis name within the machine"),
        Field("revision", "Revision", "text", default="A", help="design revision"),
        Field("author", "Author", "text", default="", help="who made this revision"),
        Field("date", "Date", "text", default="", help="date of the revision as the user gives it (YYYY-MM-DD)"),
    ),
)

CYLINDER = Section(
    "cylinder",
    "Cylinder",
    (
        Field("bore", "Bore D", "length", "mm", 80, low=0, low_open=True, high=1000,
              help="piston diameter; ISO 3320 lists standard bores", source="demo scenario",
              slider=(25, 250, 1)),
        Field("rod", "Rod d", "length", "mm", 45, low=0, low_open=True, high=1000,
              help="rod diameter, smaller than the bore", source="demo scenario",
              slider=(12, 180, 1)),
        Field("stroke", "Stroke", "length", "mm", 600, low=0, low_open=True, high=20000,
              help="full stroke", source="demo scenario"),
        Field("rated_pressure", "Cylinder rated pressure", "pressure", "bar", 210, low=0, low_open=True,
              high=2000, help="maximum working pressure of the cylinder from its data sheet",
              source="user's data sheet"),
        Field("mounting", "Mounting (Euler case)", "choice", default="pinned-pinned",
              choices=("pinned-pinned", "fixed-pinned", "fixed-fixed", "fixed-free"),
              help="end fixing of the extended cylinder for the buckling check", source="common practice"),
        Field("buckling_length", "Buckling length", "length", "mm", None, low=0, low_open=True, high=50000,
              optional=True, help="pin-to-pin length of the extended cylinder (empty: estimated as twice the "
                                  "stroke plus four bores, see the buckling finding)",
              source="common practice (from memory: a clevis-mounted cylinder closes to about its stroke plus "
                     "three to four bores; the high end taken)"),
        Field("rod_yield", "Rod yield strength", "pressure", "MPa", 355, low=100, high=2000,
              help="yield strength of the rod steel, for the short-rod (Johnson) buckling check",
              source="from memory (C45 normalised about 355 MPa; take the rod maker's value)"),
    ),
)

OIL = Section(
    "oil",
    "Oil",
    (
        Field("grade", "Viscosity grade", "choice", default="VG46",
              choices=("VG10", "VG15", "VG22", "VG32", "VG46", "VG68", "VG100", "VG150", "custom"),
              help="ISO 3448 grade; sets the 40 °C viscosity unless custom", source="ISO 3448"),
        Field("nu40", "Viscosity at 40 °C", "kinematic_viscosity", "cSt", 46, low=2, high=10000,
              help="datasheet kinematic viscosity at 40 °C", source="ISO 3448 grade midpoint"),
        Field("nu100", "Viscosity at 100 °C", "kinematic_viscosity", "cSt", 6.8, low=2, high=1000,
              help="datasheet kinematic viscosity at 100 °C", source="typical datasheet value (from memory)"),
        Field("density15", "Density at 15 °C", "density", "kg/m**3", 870, low=600, high=1300,
              help="oil density at 15 °C", source="mineral oil typical (from memory)"),
        Field("expansion", "Thermal expansion", "per_temperature", "1/K", 7e-4, low=0, high=0.005,
              help="volumetric expansion coefficient", source="mineral oil typical (from memory)"),
        Field("bulk_modulus", "Oil bulk modulus", "pressure", "bar", 14000, low=100, high=30000,
              help="the oil alone: pure mineral oil 14,000 to 18,000 bar, the low end taken; lines and air are "
                   "added from their own inputs (with hoses 7,000 to 12,000 bar is typical)",
              source="from memory"),
        Field("air_content", "Entrained air", "dimensionless", "%", 0.2, low=0, high=10,
              help="undissolved air as a share of the oil volume at atmospheric pressure",
              source="from memory (0.1 to 1 % in a well-kept system)"),
        Field("pour_point", "Pour point", "temperature", "degC", -30, low=-80, high=30,
              help="below this the viscosity model is not used", source="typical datasheet value (from memory)"),
    ),
)

SUPPLY = Section(
    "supply",
    "Supply",
    (
        Field("displacement", "Pump displacement", "displacement", "cm**3", 16, low=0, low_open=True, high=2000,
              help="fixed pump displacement per revolution", source="demo scenario"),
        Field("shaft_speed", "Pump shaft speed", "shaft_speed", "rpm", 1450, low=0, low_open=True, high=6000,
              help="motor speed", source="demo scenario (4-pole motor at 50 Hz, common practice)"),
        Field("volumetric_efficiency", "Pump volumetric efficiency", "dimensionless", "", 0.93, low=0.5,
              low_open=False, high=1.0, help="delivered over geometric flow", source="from memory"),
        Field("overall_efficiency", "Pump overall efficiency", "dimensionless", "", 0.85, low=0.3, high=1.0,
              help="hydraulic power p Q over shaft power (volumetric x hydromechanical)",
              source="from memory (gear and vane pumps about 0.80 to 0.90 near their rated point)"),
        Field("pump_flow", "Pump flow (overrides displacement)", "flow", "L/min", None, low=0, low_open=True,
              high=5000, help="give the delivered flow directly instead of displacement and speed",
              optional=True),
        Field("relief_cracking", "Relief cracking pressure", "pressure", "bar", 160, low=0, low_open=True,
              high=1000, help="pressure at which the relief valve starts to open", source="demo scenario"),
        Field("relief_full_flow", "Relief full-flow pressure", "pressure", "bar", 172, low=0, low_open=True,
              high=1000, help="pressure with all pump flow over the relief valve", source="demo scenario"),
        Field("drive_power", "Installed drive power", "power", "kW", 7.5, low=0, low_open=True, high=10000,
              help="electric motor rating of the power unit", source="demo scenario"),
    ),
)

FLOW_VALVE = Section(
    "flow_valve",
    "Flow valve",
    (
        Field("arrangement", "Arrangement", "choice", default="meter-out",
              choices=("meter-in", "meter-out", "bleed-off"),
              help="meter into the driving chamber, out of the driven chamber, or bleed off to tank", source="demo scenario"),
        Field("direction", "Controlled direction", "choice", default="retract", choices=("extend", "retract"),
              help="the motion whose speed the flow valve sets", source="demo scenario"),
        Field("kind", "Valve kind", "choice", default="compensated",
              choices=("orifice", "throttle", "needle", "compensated"),
              help="sharp orifice, long throttle, needle throttle, or pressure-compensated flow valve", source="demo scenario"),
        Field("diameter", "Restrictor diameter", "length", "mm", 2.0, low=0, low_open=True, high=100,
              help="orifice or throttle bore", slider=(0.3, 10, 0.05), source="demo scenario"),
        Field("length", "Throttle length", "length", "mm", 80, low=0, low_open=True, high=2000,
              help="length of a long throttle", source="demo scenario"),
        Field("cd", "Discharge coefficient (turbulent)", "dimensionless", "", 0.61, low=0.3, high=1.0,
              help="sharp-edged orifice, fully turbulent", source="Merritt (1967), from memory"),
        Field("seat_diameter", "Needle seat diameter", "length", "mm", 4, low=0, low_open=True, high=100,
              help="seat bore of a needle throttle", source="demo scenario"),
        Field("half_angle", "Needle cone half-angle", "angle", "deg", 15, low=0, low_open=True, high=89,
              help="half-angle of the needle cone", source="demo scenario"),
        Field("turns", "Needle opening", "angle", "turn", 1.0, low=0, high=50,
              help="turns open from the seat (1 turn = 360 deg)", source="demo scenario"),
        Field("pitch", "Needle thread pitch", "length", "mm", 0.5, low=0, low_open=True, high=10,
              help="lift per turn", source="demo scenario"),
        Field("setting", "Compensated flow setting", "flow", "L/min", 12, low=0, low_open=True, high=5000,
              help="flow held by the pressure-compensated valve", source="demo scenario", slider=(0.5, 40, 0.5)),
        Field("compensator_drop", "Compensator spring drop", "pressure", "bar", 6, low=0.5, high=50,
              help="metering drop the compensator holds", source="typical 4 to 10 bar (from memory)"),
        Field("min_drop", "Minimum working drop", "pressure", "bar", 8, low=0.5, high=100,
              help="below it the compensator is wide open", source="typical datasheet value (from memory)"),
        Field("droop", "Flow droop over 100 bar", "dimensionless", "%", 2, low=0, high=20,
              help="flow change per 100 bar of valve drop above the minimum", source="from memory"),
        Field("check_cracking", "Reverse check cracking", "pressure", "bar", 0.5, low=0, high=20,
              help="cracking pressure of the reverse free-flow check", source="typical 0.3 to 5 bar (from memory)"),
        Field("check_gradient", "Reverse check flow drop", "pressure_per_flow", "bar/(L/min)", 0.1, low=0,
              low_open=True, high=100, help="drop of the reverse check per flow above cracking",
              source="from memory"),
    ),
)

HOLDING = Section(
    "holding",
    "Load-holding valve",
    (
        Field("kind", "Holding valve", "choice", default="counterbalance",
              choices=("none", "counterbalance", "back-pressure"),
              help="counterbalance (pilot-assisted) or a back-pressure valve in series, on the load-holding side", source="demo scenario"),
        Field("side", "Load-holding side", "choice", default="cap", choices=("cap", "rod"),
              help="the chamber whose outflow the holding valve restrains", source="demo scenario"),
        Field("setting", "Setting", "pressure", "bar", 130, low=0, low_open=True, high=1000,
              help="counterbalance or back-pressure setting", source="demo scenario", slider=(10, 350, 1)),
        Field("pilot_ratio", "Pilot ratio", "dimensionless", "", 3, low=0, low_open=True, high=20,
              help="counterbalance pilot area over seat area (R:1)", source="demo scenario"),
        Field("gradient", "Opening gradient", "pressure_per_flow", "bar/(L/min)", 0.5, low=0, low_open=True,
              high=100, help="pressure rise above the opening point per flow", source="from memory"),
        Field("spring_chamber", "Counterbalance spring chamber", "choice", default="cautious",
              choices=("cautious", "outlet-referenced", "vented"),
              help="drained to the valve outlet (outlet pressure adds (1 + R) times to the opening pressure), "
                   "vented to air (outlet pressure has no effect), or cautious: whichever gives this design the "
                   "higher pressures while lowering",
              source="common practice (take the type from the data sheet; without it the more cautious one)"),
        Field("open_gradient", "Drop fully open", "pressure_per_flow", "bar/(L/min)", 0.2, low=0, low_open=True,
              high=100, help="drop of the counterbalance held fully open by its pilot, per flow",
              source="from memory (a small cartridge piloted fully open drops 3 to 6 bar at 20 L/min)"),
        Field("check_cracking", "Reverse check cracking", "pressure", "bar", 1, low=0, high=20,
              help="cracking pressure of the free-flow check", source="typical 0.3 to 5 bar (from memory)"),
        Field("check_gradient", "Reverse check flow drop", "pressure_per_flow", "bar/(L/min)", 0.1, low=0,
              low_open=True, high=100, help="drop of the free-flow check per flow above cracking",
              source="from memory"),
    ),
)

OPERATION = Section(
    "operation",
    "Operation",
    (
        Field("loads", "Load cases, both motions", "quantity_list", "kN", [2, 6, 10], list_dimension="force",
              low=-5e4, high=5e4, optional=True,
              help="external force on the rod while it moves either way, positive pushing it in (resists "
                   "extension, overruns retraction); may be [] when the lists of each motion hold the cases",
              source="demo scenario"),
        Field("loads_extend", "Load cases, extending only", "quantity_list", "kN", None, list_dimension="force",
              low=-5e4, high=5e4, optional=True,
              help="external forces that act only while the rod extends (same sign: positive pushes the rod in)"),
        Field("loads_retract", "Load cases, retracting only", "quantity_list", "kN", None, list_dimension="force",
              low=-5e4, high=5e4, optional=True,
              help="external forces that act only while the rod retracts (same sign: positive pushes the rod in)"),
        Field("work_force", "Force at the work", "force", "kN", None, low=0, high=5e4, optional=True,
              help="force the rod must apply at the end of the working motion (pressing, clamping, splitting): "
                   "the axis stalls there with the driving chamber at the relief pressure"),
        Field("work_motion", "Working motion", "choice", "", "extend", choices=("extend", "retract"),
              help="the motion at whose end the work force is applied", source="common practice (most presses "
                   "and clamps work extending)"),
        Field("friction", "Running friction", "force", "kN", 1.0, low=0, high=1e5,
              help="seal friction opposing motion; typically 2 to 5 bar on the bore (80 mm: 1.0 to 2.5 kN)",
              source="from memory (2 to 5 bar equivalent; 2 bar on the default 80 mm bore)"),
        Field("temp_min", "Oil temperature, cold", "temperature", "degC", 20, low=-60, high=150,
              help="coldest running oil temperature", source="demo scenario"),
        Field("temp_max", "Oil temperature, warm", "temperature", "degC", 60, low=-60, high=150,
              help="warmest running oil temperature", source="demo scenario"),
        Field("tank_pressure", "Return-line back pressure", "pressure", "bar", 2, low=0, high=50,
              help="pressure at the valve's tank port (filter, cooler, line)", source="common practice"),
        Field("target_speed", "Target speed", "velocity", "mm/s", 80, low=0, low_open=True, high=5000,
              help="speed the controlled motion must reach", source="demo scenario"),
        Field("speed_tolerance", "Speed tolerance", "dimensionless", "%", 15, low=0, high=100,
              help="allowed speed deviation over loads and temperatures", source="demo scenario"),
        Field("mass", "Moving mass", "mass", "kg", 800, low=0, high=1e7,
              help="load and rod mass (for natural frequency and, with an inclination, its weight)",
              source="demo scenario"),
        Field("inclination", "Rod inclination", "angle", "deg", 0, low=-90, high=90,
              help="rod axis above horizontal, rod end up: the moving mass's weight m g sin(angle) is added "
                   "to every load case (0 when the load cases already include the weight)",
              source="demo scenario"),
    ),
)

RATINGS = Section(
    "ratings",
    "Ratings and lines",
    (
        Field("hose_rating", "Hose rated pressure", "pressure", "bar", 250, low=0, low_open=True, high=2000,
              help="maximum working pressure of the hoses", source="user's data sheet"),
        Field("valve_rating", "Valve rated pressure", "pressure", "bar", 315, low=0, low_open=True, high=2000,
              help="lowest maximum working pressure of the valves", source="user's data sheet"),
        Field("pressure_line_bore", "Pressure line bore", "length", "mm", 10, low=0, low_open=True, high=500,
              help="inside diameter of the pump-to-valve line", source="demo scenario"),
        Field("return_line_bore", "Return line bore", "length", "mm", 12, low=0, low_open=True, high=500,
              help="inside diameter of the return line", source="demo scenario"),
        Field("suction_line_bore", "Suction line bore", "length", "mm", 25, low=0, low_open=True, high=500,
              help="inside diameter of the pump suction line", source="demo scenario"),
        Field("cap_line_bore", "Cap line bore", "length", "mm", 10, low=0, low_open=True, high=500,
              help="inside diameter of the line from the valves to the cap port", source="demo scenario"),
        Field("rod_line_bore", "Rod line bore", "length", "mm", 10, low=0, low_open=True, high=500,
              help="inside diameter of the line from the valves to the rod port", source="demo scenario"),
        Field("cap_line_length", "Cap line length", "length", "m", 1.5, low=0, high=100,
              help="length of the line between the valves and the cap port (its volume is dead volume)",
              source="demo scenario"),
        Field("rod_line_length", "Rod line length", "length", "m", 1.5, low=0, high=100,
              help="length of the line between the valves and the rod port (its volume is dead volume)",
              source="demo scenario"),
        Field("line_kind", "Cylinder lines", "choice", default="hose", choices=("hose", "steel tube"),
              help="hoses or steel tubes between the valves and the cylinder (their compliance)",
              source="demo scenario"),
        Field("hose_modulus", "Hose volumetric stiffness", "pressure", "bar", 3000, low=100, high=20000,
              help="pressure over relative volume growth of the hose (from the maker's expansion data)",
              source="from memory (about 1,000 bar textile-braided to 7,000 bar spiral-wire)"),
        Field("tube_wall", "Tube wall thickness", "length", "mm", 1.5, low=0, low_open=True, high=50,
              help="wall of a steel tube line (thin-wall stiffness E t / d)", source="demo scenario"),
    ),
)

LIMITS = Section(
    "limits",
    "Check limits",
    (
        Field("counterbalance_factor", "Counterbalance setting factor", "dimensionless", "", 1.3, low=1.0,
              high=3.0, help="setting over the highest load-induced pressure", source="common practice"),
        Field("pressure_margin", "Pressure caution margin", "dimensionless", "%", 10, low=0, high=50,
              help="caution when a pressure is within this share of its rating", source="common practice"),
        Field("cavitation_abs", "Lowest absolute chamber pressure", "pressure", "bar", 0.3, low=0, high=1,
              help="absolute pressure below which a chamber is taken as cavitating", source="from memory"),
        Field("buckling_factor", "Buckling safety factor", "dimensionless", "", 3.5, low=1.0, high=10,
              help="Euler critical load over the highest rod compression", source="common practice (from memory)"),
        Field("heat_share", "Throttling heat share", "dimensionless", "%", 30, low=0, high=100,
              help="caution when valve and relief losses exceed this share of drive power",
              source="common practice"),
        Field("v_suction", "Suction line velocity", "velocity", "m/s", 1.2, low=0, low_open=True, high=10,
              help="highest mean oil velocity in the suction line", source="common practice"),
        Field("v_return", "Return line velocity", "velocity", "m/s", 4, low=0, low_open=True, high=20,
              help="highest mean oil velocity in the return line (2 to 4 m/s)", source="common practice"),
        Field("v_pressure", "Pressure line velocity", "velocity", "m/s", 6, low=0, low_open=True, high=30,
              help="highest mean oil velocity in the pressure line (3 to 6 m/s)", source="common practice"),
    ),
)

STUDY = Section(
    "study",
    "Study settings",
    (
        Field("target_flow", "Target flow through the restrictor", "flow", "L/min", 12, low=0, low_open=True,
              high=5000, help="flow the restrictor must pass at the available drop", source="demo scenario",
              slider=(0.5, 60, 0.5)),
        Field("available_drop", "Available pressure drop", "pressure", "bar", 20, low=0, low_open=True, high=1000,
              help="pressure drop the restrictor may take at the target flow", source="demo scenario",
              slider=(1, 200, 1)),
        Field("design_temp", "Sizing temperature", "temperature", "degC", 40, low=-60, high=150,
              help="oil temperature at which the restrictor is sized", source="demo scenario"),
        Field("load_min", "Sweep load, lowest", "force", "kN", None, low=-1e5, high=1e5, optional=True,
              help="lowest load of the curves against load (empty: the load cases' range widened by a quarter)"),
        Field("load_max", "Sweep load, highest", "force", "kN", None, low=-1e5, high=1e5, optional=True,
              help="highest load of the curves against load (empty: the load cases' range widened by a quarter)"),
        Field("pilot_ratios", "Pilot ratios to compare", "quantity_list", "", [2, 3, 5, 8],
              list_dimension="dimensionless", low=0, low_open=True, high=20, help="counterbalance pilot ratios shown side by side",
              source="common practice (typical catalogue ratios, from memory)"),
        Field("points", "Curve points", "dimensionless", "", 400, low=20, high=5000, integer=True,
              help="points per curve", source="common practice"),
    ),
)

MOTION = Section(
    "motion",
    "Motion in time",
    (
        Field("profile", "Command profile", "text", default="",
              help="moves separated by ';': 'extend' or 'retract' (to the end of the stroke), 'extend to 800 mm', "
                   "'retract for 2 s', 'stop 0.5 s' (empty: one full stroke out and back, 0.5 s dwell each end)",
              source="common practice (one full stroke out and back)"),
        Field("ramp_open", "Directional valve opening ramp", "time", "ms", 100, low=0, low_open=True, high=10000,
              help="time the directional valve takes to open fully (soft-shift or proportional valve)",
              source="from memory (soft-shift and proportional valves 50 to 300 ms)"),
        Field("ramp_close", "Directional valve closing ramp", "time", "ms", 100, low=0, low_open=True, high=10000,
              help="time the directional valve takes to close fully", source="from memory (as the opening ramp)"),
        Field("valve_drop", "Directional valve drop at pump flow", "pressure", "bar", 3, low=0, low_open=True,
              high=100, help="pressure drop of each open path of the directional valve at the pump flow",
              source="from memory (a directional valve sized to its flow drops 2 to 5 bar)"),
        Field("load_positions", "Load table positions", "quantity_list", "mm", None, list_dimension="length",
              low=0, high=20000, optional=True,
              help="piston positions from the cap end of the load table (empty: the highest load case all along)"),
        Field("load_forces", "Load table forces", "quantity_list", "kN", None, list_dimension="force",
              low=-5e4, high=5e4, optional=True,
              help="load at each table position, positive pushing the rod in (linear between points)"),
        Field("breakaway", "Breakaway friction", "force", "kN", None, low=0, high=1e5, optional=True,
              help="static friction the piston must overcome to start (empty: 1.5 times the running friction)",
              source="from memory (seals break away at 1.2 to 2 times their running friction)"),
        Field("viscous", "Viscous friction, N s/m", "dimensionless", "", 0, low=0, high=1e7,
              help="friction per speed, in N s/m (seal and guide drag that grows with speed)",
              source="from memory (small against the running friction; 0 leaves it out)"),
        Field("holding_lag", "Holding valve time constant", "time", "ms", 20, low=0, low_open=True, high=1000,
              help="first-order lag of the counterbalance's opening behind its pilot (poppet and damping orifice)",
              source="from memory (pilot-operated poppet cartridges respond in a few ms to a few tens of ms; "
                     "take the data sheet's step response)"),
        Field("impact_speed", "End-stop impact speed limit", "velocity", "mm/s", 100, low=0, low_open=True,
              high=5000, help="highest speed at which the piston may reach an end of the stroke",
              source="user's data sheet (from memory: without end cushioning about 0.1 m/s)"),
        Field("ramp_periods", "Ramp over natural periods, least", "dimensionless", "", 3, low=0, high=100,
              help="a ramp shorter than this many periods of the hydraulic natural frequency excites oscillation",
              source="rule of thumb (from memory)"),
        Field("oscillation_share", "Sustained oscillation limit", "dimensionless", "%", 10, low=0, low_open=True,
              high=100, help="speed swing (half peak to peak) while lowering, as a share of the mean lowering "
                             "speed, above which the lowering hunts",
              source="common practice (from memory)"),
        Field("cycle_time", "Time allowed for the profile", "time", "s", None, low=0, low_open=True, high=1e5,
              optional=True, help="time the machine cycle allows for the whole command profile (empty: each "
                                  "controlled move against the target speed less its tolerance)"),
    ),
    only_for="axis-motion",
)

#: the machine cycle's own inputs (the ``[cycle]`` table of a design file, read by
#: :mod:`workbook.cycle_file`); machine-level, so not one of the axis sections
CYCLE = Section(
    "cycle",
    "Machine cycle and tank",
    (
        Field("cycles_per_hour", "Cycles per hour", "dimensionless", "", 40, low=0, low_open=True, high=36000,
              help="how often the whole cycle repeats; the time the steps leave free is idle time",
              source="demo scenario"),
        Field("idle", "Pump during dwells", "choice", default="relief", choices=("relief", "unloaded"),
              help="against the relief valve at its full-flow pressure, or unloaded to tank at the unloading "
                   "pressure", source="demo scenario"),
        Field("unload_pressure", "Unloading pressure", "pressure", "bar", 5, low=0, high=100,
              help="pump pressure with the pump unloaded to tank (valve and return line)",
              source="from memory (3 to 8 bar through an unloading valve and filter)"),
        Field("ambient", "Ambient temperature", "temperature", "degC", 25, low=-40, high=80,
              help="air around the tank", source="demo scenario"),
        Field("oil_max", "Highest oil temperature", "temperature", "degC", 60, low=0, high=150,
              help="the steady oil temperature the power unit must hold",
              source="common practice for mineral oil (the oil maker's data decide)"),
        Field("tank_volume", "Tank oil volume", "volume", "L", 100, low=0, low_open=True, high=100000,
              help="oil in the tank", source="demo scenario"),
        Field("tank_surface", "Tank heat-shedding surface", "area", "m**2", None, low=0, low_open=True, high=1000,
              optional=True, help="wetted surface of the tank walls (empty: 5 V^(2/3), a cube of the oil "
                                  "volume without its top)", source="common practice (from memory)"),
        Field("heat_transfer", "Tank heat transfer coefficient, W/(m² K)", "dimensionless", "", 12, low=1, high=200,
              help="natural convection and radiation of a steel tank in still air, in W/(m² K)",
              source="from memory (10 to 15 W/(m² K) for a steel tank in still air)"),
        Field("steel_mass", "Tank and unit steel mass", "mass", "kg", None, low=0, high=1e6, optional=True,
              help="steel that warms with the oil (empty: the walls and lid at 3 mm)",
              source="common practice (from memory)"),
        Field("oil_specific_heat", "Oil specific heat, J/(kg K)", "dimensionless", "", 1900, low=500, high=5000,
              help="specific heat capacity of the oil, in J/(kg K)",
              source="from memory (mineral oil about 1.9 kJ/(kg K))"),
        Field("cooler_duty", "Installed cooler duty", "power", "kW", 0, low=0, high=10000,
              help="heat the cooler removes at the highest oil temperature (0: no cooler); thermostatic",
              source="demo scenario"),
        Field("motor_overload", "Motor short-time overload", "dimensionless", "", 1.25, low=1, high=3,
              help="peak shaft power allowed over the installed drive power for a short step",
              source="from memory (standard induction motors carry 1.25 to 1.5 times rated briefly; the "
                     "motor maker's duty-cycle data decide)"),
        Field("tank_minutes", "Tank volume, minutes of pump flow", "dimensionless", "", 3, low=0.5, high=20,
              help="smallest tank volume as minutes of pump flow (caution below)",
              source="common practice (3 to 5 times the pump's flow per minute)"),
    ),
)

#: every section, in design-file order
SECTIONS: tuple[Section, ...] = (IDENTITY, CYLINDER, OIL, SUPPLY, FLOW_VALVE, HOLDING, OPERATION, RATINGS, LIMITS,
                                 STUDY, MOTION)

#: sections that describe an axis (all but identity); ``study`` holds the studies' own settings
AXIS_SECTIONS: tuple[Section, ...] = SECTIONS[1:]

BY_KEY = {s.key: s for s in SECTIONS}


def section(key: str) -> Section:
    """The section called ``key``."""
    return BY_KEY[key]


__all__ = ["SECTIONS", "AXIS_SECTIONS", "BY_KEY", "section",
           "STUDY", "MOTION", "CYCLE", "IDENTITY", "CYLINDER", "OIL", "SUPPLY", "FLOW_VALVE", "HOLDING", "OPERATION", "RATINGS", "LIMITS"]
