"""The feature catalogue: every measurable feature of a sheet, declared once.

Validation, the JSON Schema, the sheet template, the site's feature reference and the
rules' input declarations all read this table, so a feature's unit, bounds and meaning
can never disagree between them.

A feature has a key ``zone.name``, a canonical unit (bare numbers in a sheet are read in
it), physical bounds (outside is impossible: an error), a typical range (outside is
unusual: a warning) with the source of that range, a description, and how to measure it
(datum and sign convention). Choice features list their allowed words instead of a unit;
flag features are true/false.

Conventions (see the README): x from the nose rearward, z up from the ground plane,
y lateral; angles in degrees, measured from the horizontal in the side (x-z) view or from
the x axis in the plan (x-y) view unless a feature says otherwise.

Sources of the typical ranges: "common practice" marks ranges that any production-car
aerodynamicist would recognise and that have no single source; "from memory" marks
ranges recalled from the literature (Hucho, *Aerodynamics of Road Vehicles*, 4th ed.,
SAE 1998, and similar) that we could not check page by page.
"""

from __future__ import annotations

from dataclasses import dataclass

ZONES: dict[str, str] = {
    "vehicle": "Vehicle",
    "dimensions": "Dimensions",
    "mass": "Mass",
    "powertrain": "Powertrain",
    "front": "Front",
    "windshield": "Windshield and A-pillars",
    "rear": "Roof and rear",
    "sides": "Sides and mirrors",
    "underbody": "Underbody and diffuser",
    "wheels": "Wheels and wheelhouses",
    "cooling": "Cooling and internal flow",
}

# The zones a review scores (rules and attachments use them): the body zones above that
# carry rules, plus the two computed ones.
REVIEW_ZONES: dict[str, str] = {
    **{zone: ZONES[zone] for zone in ("front", "windshield", "rear", "sides", "underbody", "wheels", "cooling")},
    "stability": "Lift and stability",
    "data": "Data quality",
}
ALL_ZONES: dict[str, str] = {**ZONES, **REVIEW_ZONES}

VEHICLE_CLASSES = ("sedan", "fastback", "hatchback", "estate", "crossover", "suv", "pickup", "van", "sports")

COMMON = "common practice"
MEMORY = "from memory (Hucho, Aerodynamics of Road Vehicles, 4th ed., 1998; not checked page by page)"


@dataclass(frozen=True)
class Feature:
    """One measurable feature of a vehicle revision."""

    key: str
    kind: str  # "quantity", "choice" or "flag"
    description: str
    how_to_measure: str
    unit: str = ""  # canonical unit of a quantity ("" for a plain fraction or count)
    bounds: tuple[float, float] | None = None  # physical limits, in the canonical unit
    typical: tuple[float, float] | None = None  # usual range, in the canonical unit
    typical_source: str = COMMON
    choices: tuple[str, ...] = ()
    required: bool = False
    example: object = None  # a value shown in the template (required features only)
    sign: str = ""  # which way is positive, for every quantity that can be negative
    integer: bool = False
    without_rule: str = ""  # why the feature is kept though no rule reads it (the review or calc uses it)

    @property
    def zone(self) -> str:
        return self.key.split(".", 1)[0]

    @property
    def name(self) -> str:
        return self.key.split(".", 1)[1]

    def unit_label(self) -> str:
        if self.kind == "choice":
            return "one of: " + ", ".join(self.choices)
        if self.kind == "flag":
            return "true or false"
        if self.integer and not self.unit:
            return "count"
        return self.unit or "fraction"

    def typical_text(self) -> str:
        if not self.typical:
            return ""
        low, high = self.typical
        unit = f" {self.unit}" if self.unit else ""
        return f"{low:g} to {high:g}{unit}"


def _q(key, unit, bounds, typical, description, how, source=COMMON, **extra) -> Feature:
    return Feature(key, "quantity", description, how, unit, bounds, typical, source, **extra)


def _choice(key, choices, description, how, **extra) -> Feature:
    return Feature(key, "choice", description, how, choices=tuple(choices), **extra)


def _flag(key, description, how) -> Feature:
    return Feature(key, "flag", description, how)


_ROAD_LOAD = "vehicle data: the review's road-load, energy and range consequences use it"
_GEOMETRY = "vehicle data: the review's lift per axle and the site's figures use it"


FEATURES: tuple[Feature, ...] = (
    # -- vehicle ---------------------------------------------------------------------
    _choice("vehicle.class", VEHICLE_CLASSES,
            "Body class; sets the expected range of drag coefficient and which rules apply.",
            "From the program brief: the body style as sold.", required=True, example="sedan"),
    # -- dimensions ------------------------------------------------------------------
    _q("dimensions.length", "m", (1.0, 12.0), (3.5, 5.5),
       "Overall length, bumper to bumper.", "Largest x extent of the body, mirrors and tow hooks excluded.",
       required=True, example=4.8),
    _q("dimensions.width", "m", (0.5, 3.0), (1.6, 2.1),
       "Overall width without mirrors.", "Largest y extent of the body at the widest section, mirrors folded or excluded.",
       required=True, example=1.9),
    _q("dimensions.height", "m", (0.5, 4.5), (1.1, 2.0),
       "Overall height at curb mass.", "Highest z above the ground plane at curb ride height, roof antenna excluded.",
       required=True, example=1.45),
    _q("dimensions.wheelbase", "m", (0.5, 8.0), (2.3, 3.3),
       "Distance between front and rear axle centres.", "x distance between wheel centres on the same side.",
       without_rule=_GEOMETRY),
    _q("dimensions.front_overhang", "m", (0.0, 4.0), (0.7, 1.2),
       "Front overhang: distance from the nose to the front axle centre.",
       "x distance from the forwardmost point of the body to the front wheel centre (x from the nose).",
       without_rule="vehicle data: `results surface` moves the lift to the axles from it"),
    _q("dimensions.track_front", "m", (0.5, 3.0), (1.35, 1.75),
       "Front track.", "y distance between the front tyre contact-patch centres.", without_rule=_GEOMETRY),
    _q("dimensions.track_rear", "m", (0.5, 3.0), (1.35, 1.75),
       "Rear track.", "y distance between the rear tyre contact-patch centres.", without_rule=_GEOMETRY),
    _q("dimensions.ground_clearance", "mm", (0.0, 800.0), (90.0, 250.0),
       "Minimum ground clearance of the main underbody plane at curb ride height.",
       "Smallest z of the flat underbody between the axles; local parts (exhaust, jacking points) excluded."),
    _q("dimensions.frontal_area", "m^2", (0.3, 12.0), (1.8, 4.2),
       "Frontal area A, the reference area of the drag coefficient.",
       "Area of the silhouette projected on the y-z plane (view along x), mirrors and wheels included."),
    # -- mass ------------------------------------------------------------------------
    _q("mass.curb", "kg", (100.0, 10000.0), (1000.0, 2800.0),
       "Curb mass (ready to drive, no payload).", "From the weight sheet; WLTP test mass adds payload and options.",
       required=True, example=1900),
    _q("mass.front_axle_share", "", (0.05, 0.95), (0.42, 0.60),
       "Share of the curb mass carried by the front axle.", "Front axle load / total load on a level scale; 0.52 or '52 %'."),
    _q("mass.rotating_mass_factor", "", (1.0, 1.3), (1.02, 1.08),
       "Equivalent-mass factor for rotating inertia (wheels, driveline).",
       "1 + (rotational inertia reduced to the wheel) / (m r^2); 1.03 is a usual EV value.", MEMORY,
       without_rule=_ROAD_LOAD),
    # -- powertrain ------------------------------------------------------------------
    _choice("powertrain.kind", ("electric", "combustion", "hybrid"),
            "Energy source; selects battery (kWh, km of range) or fuel (L per 100 km) consequences.",
            "From the program brief.", required=True, example="electric"),
    _q("powertrain.battery_usable", "kWh", (1.0, 400.0), (40.0, 120.0),
       "Usable battery energy (net, as the range estimate uses it).", "From the battery specification, net of buffers.",
       without_rule=_ROAD_LOAD),
    _choice("powertrain.fuel", ("petrol", "diesel"),
            "Fuel for combustion and hybrid vehicles; sets the heating value used for L per 100 km.",
            "From the engine specification.", without_rule=_ROAD_LOAD),
    _q("powertrain.fuel_tank", "L", (5.0, 400.0), (35.0, 90.0),
       "Usable fuel tank volume.", "From the fuel system specification.", without_rule=_ROAD_LOAD),
    _q("powertrain.drivetrain_efficiency", "", (0.3, 1.0), (0.80, 0.95),
       "Mean efficiency from battery (or engine shaft) to the wheels when driving.",
       "Cycle-average of wheel energy / battery (or crank) energy; inverter, motor, gear and bearings included.", MEMORY,
       without_rule=_ROAD_LOAD),
    _q("powertrain.engine_efficiency", "", (0.05, 0.6), (0.22, 0.40),
       "Mean engine efficiency, fuel energy to crank, for combustion vehicles.",
       "Cycle-average brake efficiency from the engine map.", MEMORY, without_rule=_ROAD_LOAD),
    _q("powertrain.regen_efficiency", "", (0.0, 1.0), (0.0, 0.85),
       "Share of the braking energy at the wheels that returns to the battery.",
       "0 for a vehicle without regenerative braking; cycle-average, friction braking included.", MEMORY,
       without_rule=_ROAD_LOAD),
    _q("powertrain.rolling_resistance", "", (0.001, 0.05), (0.006, 0.012),
       "Rolling resistance coefficient Crr of the tyres fitted.", "From the tyre label class or a coast-down fit (F0 / (m g)).",
       MEMORY, without_rule=_ROAD_LOAD),
    _q("powertrain.top_speed", "km/h", (20.0, 500.0), (130.0, 260.0),
       "Maximum speed (limited or natural).", "From the performance specification."),
    # -- front -----------------------------------------------------------------------
    _q("front.upper_edge_radius", "mm", (0.0, 1000.0), (20.0, 200.0),
       "Radius of the front upper edge (bumper to hood transition) in the side view.",
       "Fit a circle to the centreline section over the region where curvature is highest."),
    _q("front.corner_radius", "mm", (0.0, 1000.0), (50.0, 300.0),
       "Radius of the front corners in the plan view (bumper to side).",
       "Fit a circle to the horizontal section at bumper height over the corner."),
    _q("front.hood_edge_height", "mm", (100.0, 2500.0), (550.0, 900.0),
       "Height above ground of the front upper edge, where the front face turns into the hood, on the centreline.",
       "z of the middle of the front upper edge radius on the centreline section, curb ride height."),
    _q("front.stagnation_height", "mm", (50.0, 2000.0), (300.0, 700.0),
       "Height of the forwardmost point of the nose above the ground.",
       "z of the point with the smallest x on the centreline section."),
    _q("front.hood_angle", "deg", (-20.0, 60.0), (5.0, 15.0),
       "Hood inclination in the side view, positive rising rearward.",
       "Chord angle from the hood leading edge to the cowl, from horizontal.",
       sign="positive when the hood rises toward the cowl"),
    _q("front.air_dam_clearance", "mm", (0.0, 800.0), (70.0, 260.0),
       "Height above ground of the lowest edge of the front air dam (spoiler lip).",
       "Smallest z of the front bumper lower edge on the centreline, curb ride height."),
    _q("front.splitter_length", "mm", (0.0, 500.0), (0.0, 80.0),
       "Forward overhang of a horizontal splitter beyond the bumper face; 0 for none.",
       "x distance from the bumper face to the splitter leading edge."),
    _flag("front.air_curtains", "Air curtains: ducts from the bumper that blow across the front wheel face.",
          "True when ducted outlets exit in front of the front wheels."),
    # -- windshield and A-pillars ----------------------------------------------------
    _q("windshield.angle", "deg", (5.0, 90.0), (22.0, 35.0),
       "Windshield inclination from horizontal in the side view (a 60 deg rake from vertical is 30 deg here).",
       "Chord angle of the glass on the centreline section, cowl to header."),
    _q("windshield.a_pillar_radius", "mm", (0.0, 500.0), (10.0, 80.0),
       "Radius of the A-pillar edge between windshield and side glass.",
       "Fit a circle to a section normal to the pillar at mid height."),
    _q("windshield.a_pillar_step", "mm", (0.0, 80.0), (0.0, 10.0),
       "Height of the step from the windshield surface to the A-pillar trim (rain gutter depth).",
       "Normal offset of the pillar trim above the glass surface at mid height; 0 for flush glazing."),
    _q("windshield.header_radius", "mm", (0.0, 1000.0), (30.0, 200.0),
       "Radius of the windshield-to-roof transition (the header).",
       "Fit a circle to the centreline section over the header."),
    _flag("windshield.wipers_concealed", "Wipers parked below the hood trailing edge.",
          "True when the parked wiper arms sit below the line of sight along the hood surface."),
    # -- roof and rear ---------------------------------------------------------------
    _q("rear.backlight_angle", "deg", (0.0, 90.0), (12.0, 65.0),
       "Rear window (backlight) inclination from horizontal in the side view.",
       "Chord angle of the rear glass on the centreline section, roof end to glass end."),
    _q("rear.roof_backlight_radius", "mm", (0.0, 3000.0), (20.0, 800.0),
       "Radius of the roof-to-backlight transition.",
       "Fit a circle to the centreline section over the region of highest curvature at the roof end."),
    _q("rear.decklid_angle", "deg", (-40.0, 60.0), (-5.0, 15.0),
       "Decklid (trunk lid) inclination in the side view, positive falling rearward.",
       "Chord angle of the decklid on the centreline section, from horizontal.",
       sign="positive when the decklid falls toward the rear"),
    _q("rear.decklid_length", "mm", (0.0, 2000.0), (150.0, 700.0),
       "Length of the decklid from the backlight base to the rear edge.", "x extent on the centreline section."),
    _q("rear.spoiler_height", "mm", (0.0, 400.0), (0.0, 100.0),
       "Height of a rear spoiler or kick-up above the local surface; 0 for none.",
       "Normal height of the trailing edge above the surface line extended from ahead of it."),
    _q("rear.side_taper_angle", "deg", (-20.0, 45.0), (0.0, 15.0),
       "Plan-view boat-tail angle of the body sides over the last part of the body.",
       "Angle to the x axis of the side line in the horizontal section at belt height over the last 300 mm.",
       sign="positive when the sides close in toward the tail"),
    _q("rear.roof_taper_angle", "deg", (-20.0, 45.0), (0.0, 15.0),
       "Side-view drop angle of the roof over its last part (boat-tail in elevation).",
       "Angle to horizontal of the roof line over the last 300 mm before the rear edge or backlight.",
       sign="positive when the roof falls toward the rear"),
    _q("rear.separation_edge_radius", "mm", (0.0, 500.0), (0.0, 30.0),
       "Radius of the rear edges where the flow is meant to leave the body (tail-lamp corners, decklid end).",
       "Fit a circle to a section normal to the edge; sharp edges are 0 to 5 mm."),
    _q("rear.base_area", "m^2", (0.0, 10.0), (0.3, 2.5),
       "Area of the near-vertical rear face (the wake base).", "Projected y-z area of rear surfaces steeper than 60 deg."),
    _choice("rear.roof_rails", ("none", "flush", "raised"),
            "Roof rails: none, flush with the roof, or raised on feet.", "From the trim specification."),
    # -- sides and mirrors -----------------------------------------------------------
    _choice("sides.mirror_kind", ("conventional", "camera", "none"),
            "Exterior rear-view devices: glass mirrors, camera pods, or none.", "From the trim specification."),
    _q("sides.mirror_area", "m^2", (0.0, 0.3), (0.01, 0.08),
       "Frontal area of both mirror housings together.", "Projected y-z area of the mirror heads and stalks outside the body."),
    _q("sides.mirror_gap", "mm", (0.0, 400.0), (40.0, 120.0),
       "Clear gap between the mirror housing and the side glass.", "Smallest y distance from the housing to the glass."),
    _choice("sides.door_handles", ("flush", "recessed", "protruding"),
            "Door handles.", "From the trim specification."),
    _q("sides.panel_gap", "mm", (0.0, 30.0), (2.5, 5.0),
       "Typical shut-line gap on the body side.", "Nominal gap from the tolerance sheet."),
    _q("sides.sill_step", "mm", (0.0, 200.0), (0.0, 25.0),
       "Inboard step of the sill below the door surface (the side skirt set-back).",
       "y offset between the door skin and the sill at mid wheelbase."),
    # -- underbody and diffuser ------------------------------------------------------
    _q("underbody.panel_coverage", "", (0.0, 1.0), (0.25, 0.98),
       "Share of the underbody plan area between the bumpers that is covered by smooth panels.",
       "Covered area / plan area inside the wheel tracks; 0.8 or '80 %'."),
    _q("underbody.nose_rake", "deg", (-20.0, 40.0), (0.0, 10.0),
       "Upward inclination of the front underbody ahead of the front axle, from horizontal.",
       "Angle of the underbody line on the centreline from the air dam to the front axle plane.",
       sign="positive when the underbody rises toward the nose"),
    _q("underbody.diffuser_angle", "deg", (0.0, 45.0), (0.0, 18.0),
       "Upsweep angle of the rear underbody (diffuser) from horizontal.",
       "Chord angle of the underbody line on the centreline from the diffuser start to the rear edge."),
    _q("underbody.diffuser_length", "mm", (0.0, 3000.0), (200.0, 900.0),
       "Length of the diffuser ramp.", "x extent of the upswept rear underbody."),
    _q("underbody.diffuser_exposed_parts", "", (0, 50), (0, 5),
       "Count (a whole number) of the parts standing in the diffuser flow (exhaust, tow eye, "
       "suspension links, spare-wheel well).",
       "Count the parts that protrude below the diffuser surface when viewed from below.", integer=True),
    _q("underbody.diffuser_end_step", "mm", (0.0, 400.0), (0.0, 60.0),
       "Height of the vertical step from the diffuser's trailing edge up to the lower edge of the rear base "
       "(bumper); 0 when the diffuser runs out into the base edge.",
       "z difference on the centreline section between the diffuser trailing edge and the lowest point of the "
       "base above it."),
    _q("underbody.pitch", "deg", (-5.0, 5.0), (-1.0, 1.0),
       "Static pitch of the underbody, positive nose-down.",
       "Angle of the line from the front to the rear underbody datum points at curb ride height.",
       sign="positive nose-down (the front datum lower than the rear)"),
    # -- wheels and wheelhouses ------------------------------------------------------
    _q("wheels.rim_diameter", "inch", (10.0, 28.0), (16.0, 21.0),
       "Rim diameter.", "Nominal rim size from the wheel specification."),
    _q("wheels.tyre_width", "mm", (100.0, 400.0), (195.0, 285.0),
       "Nominal tyre section width.", "From the tyre designation (e.g. 235 in 235/45 R19)."),
    _choice("wheels.tyre_shoulder", ("rounded", "square"),
            "Shape of the tyre shoulder (tread-to-sidewall transition) of the tyres fitted.",
            "From the tyre drawing: rounded when the shoulder radius exceeds about 10 mm."),
    _q("wheels.rim_openness", "", (0.0, 1.0), (0.1, 0.6),
       "Open share of the rim face: open area between the spokes / area of the rim disc.",
       "Measure on a front view of the wheel; 0 for a fully covered (aero) disc."),
    _q("wheels.front_deflector_height", "mm", (0.0, 300.0), (0.0, 80.0),
       "Height of the deflector (tyre spat) ahead of each front tyre; 0 for none.",
       "z extent of the deflector below the underbody surface."),
    _flag("wheels.rear_strakes", "Strakes or spats ahead of the rear wheels.",
          "True when a deflector stands in front of each rear tyre."),
    _q("wheels.wheelhouse_gap", "mm", (0.0, 300.0), (15.0, 60.0),
       "Radial gap between the tyre and the wheel-arch lip at the top.",
       "Distance from the tyre tread to the arch lip along the radius at 12 o'clock, curb ride height."),
    _flag("wheels.wheelhouse_vented", "Front wheelhouse vented to the body side (air breather behind the wheel).",
          "True when a duct connects the front wheelhouse to an outlet on the side behind the arch."),
    _q("wheels.rear_arch_exit_radius", "mm", (0.0, 300.0), (0.0, 40.0),
       "Radius of the trailing edge of the rear wheel arch, where wheelhouse air leaves to the side.",
       "Fit a circle to a horizontal section at axle height over the rear arch trailing edge."),
    # -- cooling and internal flow ---------------------------------------------------
    _q("cooling.inlet_area", "m^2", (0.0, 1.5), (0.02, 0.15),
       "Open area of all cooling inlets in the front (grille and bumper openings).",
       "Projected y-z area of the openings through which air reaches the heat exchangers."),
    _q("cooling.required_inlet_area", "m^2", (0.0, 1.5), (0.02, 0.15),
       "Inlet area that the thermal team needs at the worst-case cooling condition.",
       "From the cooling specification (hill climb or trailer tow at high ambient)."),
    _choice("cooling.shutters", ("none", "passive", "active"),
            "Grille shutters that close the inlets when cooling is not needed.", "From the specification."),
    _flag("cooling.ducts_sealed", "Inlets sealed to the heat exchangers, so no air bypasses them.",
          "True when foam or ducts close every leak path between grille and radiator."),
    _choice("cooling.outlet", ("underbody", "wheelhouse", "hood", "side"),
            "Where the cooling air leaves the engine bay.", "From the package drawing."),
    _flag("cooling.brake_ducts", "Dedicated brake cooling ducts.", "True when ducts feed the front brakes."),
)

BY_KEY: dict[str, Feature] = {feature.key: feature for feature in FEATURES}


def feature(key: str) -> Feature:
    """The catalogue entry for ``key`` (raises KeyError for an unknown key)."""
    return BY_KEY[key]


def by_zone() -> dict[str, list[Feature]]:
    """Features grouped by zone, in catalogue order."""
    groups: dict[str, list[Feature]] = {zone: [] for zone in ZONES}
    for item in FEATURES:
        groups[item.zone].append(item)
    return groups
