"""Air properties: the International Standard Atmosphere and moist air.

The ISA (ISO 2533:1975, identical to the ICAO Standard Atmosphere 1993 below 32 km) is
defined in layers of constant temperature gradient over *geopotential* altitude H. We take
the usual *geometric* altitude h and convert, H = r0 h / (r0 + h), as both ISO 2533 and the
reference libraries do. Valid from -2 km to 84.852 km geopotential.

Moist air: density from the partial pressures of dry air and water vapour (Dalton), with
the vapour saturation pressure from Buck (1996), an improvement of Buck, "New equations
for computing vapor pressure and enhancement factor", J. Appl. Meteor. 20 (1981) 1527-1532.
Viscosity and speed of sound are those of dry air at the actual temperature; the humidity
effect on them is below 1 % in road-vehicle conditions (from memory).

All functions take and return SI units and accept numpy arrays.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

# ISO 2533:1975 constants.
G0 = 9.80665  # m/s^2, standard gravity (ISO 2533, also CGPM 1901)
R_AIR = 287.05287  # J/(kg K), specific gas constant of dry air (ISO 2533)
GAMMA = 1.4  # ratio of specific heats of dry air (ISO 2533)
EARTH_RADIUS = 6_356_766.0  # m, nominal radius for geopotential altitude (ISO 2533)
SUTHERLAND_BETA = 1.458e-6  # kg/(m s K^0.5) (ISO 2533)
SUTHERLAND_S = 110.4  # K (ISO 2533)
R_VAPOUR = 461.52  # J/(kg K), water vapour: R / M_w with M_w = 18.01528 g/mol (CODATA R)

SEA_LEVEL_TEMPERATURE = 288.15  # K (ISO 2533)
SEA_LEVEL_PRESSURE = 101_325.0  # Pa (ISO 2533)

# ISO 2533 layers: base geopotential altitude [m], base temperature [K], gradient [K/m].
_LAYERS = (
    (-2_000.0, 301.15, -0.0065),
    (11_000.0, 216.65, 0.0),
    (20_000.0, 216.65, 0.0010),
    (32_000.0, 228.65, 0.0028),
    (47_000.0, 270.65, 0.0),
    (51_000.0, 270.65, -0.0028),
    (71_000.0, 214.65, -0.0020),
)
TOP = 84_852.0  # m geopotential, upper end of the ISO 2533 tables


def _base_pressures() -> tuple[float, ...]:
    pressures = []
    # Pressure at -2 km from sea level, then layer by layer upward.
    p = SEA_LEVEL_PRESSURE * (301.15 / SEA_LEVEL_TEMPERATURE) ** (G0 / (R_AIR * 0.0065))
    for i, (h_base, t_base, lapse) in enumerate(_LAYERS):
        pressures.append(p)
        h_top = _LAYERS[i + 1][0] if i + 1 < len(_LAYERS) else TOP
        p = _layer_pressure(p, t_base, lapse, h_top - h_base)
    return tuple(pressures)


def _layer_pressure(p_base, t_base, lapse, dh):
    if lapse == 0.0:
        return p_base * np.exp(-G0 * dh / (R_AIR * t_base))
    return p_base * ((t_base + lapse * dh) / t_base) ** (-G0 / (R_AIR * lapse))


_BASE_PRESSURES = _base_pressures()


def geopotential_altitude(altitude):
    """Geopotential altitude H [m] from geometric altitude h [m]: H = r0 h / (r0 + h).

    >>> round(float(geopotential_altitude(11_019.1)), 0)
    11000.0
    """
    h = np.asarray(altitude, dtype=float)
    return EARTH_RADIUS * h / (EARTH_RADIUS + h)


def isa_temperature_pressure(altitude):
    """ISA temperature [K] and pressure [Pa] at geometric altitude [m].

    Within a layer of gradient L from base (H_b, T_b, p_b):
    T = T_b + L (H - H_b); p = p_b (T / T_b)^(-g0 / (R L)), or p = p_b exp(-g0 (H - H_b) / (R T_b)) when L = 0.

    Example (ISO 2533 table, 1000 m geometric): 281.65 K and 89 876 Pa.

    >>> t, p = isa_temperature_pressure(1000.0)
    >>> round(float(t), 2), round(float(p))
    (281.65, 89876)

    Reference: ISO 2533:1975 Standard Atmosphere.
    """
    height = geopotential_altitude(altitude)
    if np.any(height < _LAYERS[0][0]) or np.any(height > TOP):
        raise ValueError("altitude outside the ISA range -2 km to 86 km")
    bases = np.array([layer[0] for layer in _LAYERS])
    index = np.clip(np.searchsorted(bases, height, side="right") - 1, 0, len(_LAYERS) - 1)
    h_base = bases[index]
    t_base = np.array([layer[1] for layer in _LAYERS])[index]
    lapse = np.array([layer[2] for layer in _LAYERS])[index]
    p_base = np.array(_BASE_PRESSURES)[index]
    dh = height - h_base
    temperature = t_base + lapse * dh
    with np.errstate(divide="ignore", invalid="ignore"):
        graded = p_base * (temperature / t_base) ** (-G0 / (R_AIR * np.where(lapse == 0, 1.0, lapse)))
    flat = p_base * np.exp(-G0 * dh / (R_AIR * t_base))
    pressure = np.where(lapse == 0.0, flat, graded)
    return temperature, pressure


def sutherland_viscosity(temperature):
    """Dynamic viscosity of air [Pa s] by Sutherland's law: mu = beta T^1.5 / (T + S).

    Example (ISO 2533 sea level, 288.15 K): 1.7894e-5 Pa s.

    >>> f"{float(sutherland_viscosity(288.15)):.4e}"
    '1.7894e-05'

    Reference: ISO 2533:1975, beta = 1.458e-6 kg/(m s K^0.5), S = 110.4 K.
    """
    t = np.asarray(temperature, dtype=float)
    return SUTHERLAND_BETA * t**1.5 / (t + SUTHERLAND_S)


def speed_of_sound(temperature):
    """Speed of sound in dry air [m/s]: a = sqrt(gamma R T).

    Example (ISO 2533 sea level): 340.294 m/s.

    >>> round(float(speed_of_sound(288.15)), 3)
    340.294

    Reference: ISO 2533:1975.
    """
    return np.sqrt(GAMMA * R_AIR * np.asarray(temperature, dtype=float))


def saturation_pressure(temperature):
    """Saturation vapour pressure over liquid water [Pa], Buck (1996):

    e_s = 611.21 exp((18.678 - t/234.5) (t / (257.14 + t))), t in degC.

    Example: at 20 degC, 2338.3 Pa (the IAPWS-95 value is 2339.2 Pa, within 0.04 %).

    >>> round(float(saturation_pressure(293.15)), 1)
    2338.3

    Reference: A. L. Buck, Buck Research CR-1A User's Manual (1996), appendix 1, updating
    Buck, J. Appl. Meteor. 20 (1981) 1527-1532. Valid about -40 to +50 degC.
    """
    t = np.asarray(temperature, dtype=float) - 273.15
    return 611.21 * np.exp((18.678 - t / 234.5) * (t / (257.14 + t)))


def moist_air_density(temperature, pressure, relative_humidity):
    """Density of moist air [kg/m^3]: rho = (p - e) / (R_d T) + e / (R_v T), e = RH e_s(T).

    Example: 25 degC, 101 325 Pa, 60 % RH: 1.1755 kg/m^3 (CoolProp HAPropsSI, with real-gas
    corrections, gives 1.1760).

    >>> round(float(moist_air_density(298.15, 101325.0, 0.6)), 4)
    1.1755

    References: Dalton's law of partial pressures; Buck (1996) for e_s.
    """
    t = np.asarray(temperature, dtype=float)
    vapour = np.asarray(relative_humidity, dtype=float) * saturation_pressure(t)
    return (np.asarray(pressure, dtype=float) - vapour) / (R_AIR * t) + vapour / (R_VAPOUR * t)


@dataclass(frozen=True)
class Air:
    """Air state: temperature [K], pressure [Pa], density [kg/m^3], viscosity [Pa s], sound speed [m/s]."""

    temperature: float
    pressure: float
    density: float
    dynamic_viscosity: float
    speed_of_sound: float

    @property
    def kinematic_viscosity(self) -> float:
        return self.dynamic_viscosity / self.density


def air_state(altitude: float = 0.0, temperature: float | None = None, pressure: float | None = None,
              relative_humidity: float = 0.0) -> Air:
    """Air at geometric ``altitude`` [m] in the ISA, optionally with the actual
    ``temperature`` [K], ``pressure`` [Pa] and ``relative_humidity`` [0..1] replacing the
    standard values.

    Example (ISO 2533 sea level): 288.15 K, 101 325 Pa, 1.2250 kg/m^3, 1.7894e-5 Pa s, 340.29 m/s.

    >>> air = air_state(0.0)
    >>> round(air.density, 4), round(air.speed_of_sound, 2)
    (1.225, 340.29)

    Reference: ISO 2533:1975; moist air as in :func:`moist_air_density`.
    """
    isa_t, isa_p = isa_temperature_pressure(altitude)
    t = float(isa_t) if temperature is None else float(temperature)
    p = float(isa_p) if pressure is None else float(pressure)
    if t <= 0 or p <= 0:
        raise ValueError("temperature and pressure must be positive")
    if not 0.0 <= relative_humidity <= 1.0:
        raise ValueError("relative humidity must be between 0 and 1")
    density = float(moist_air_density(t, p, relative_humidity)) if relative_humidity else p / (R_AIR * t)
    return Air(t, p, density, float(sutherland_viscosity(t)), float(speed_of_sound(t)))
