"""The package's single pint registry and the helpers that turn strings into SI floats.

Only this module creates a ``UnitRegistry``. Quantities are parsed and dimension-checked here, at the
boundary; everything downstream works on SI floats.

Gas flows: ``sccm`` is a molar flow, the amount of gas that occupies one cubic centimetre per minute
at the standard conditions 0 degC (273.15 K) and 101.325 kPa. ``slm`` is 1000 sccm (standard litre
per minute, same conditions). 1 sccm = 7.4358e-7 mol/s, i.e. a throughput of 1.6888e-3 Pa m3/s at
273.15 K.
"""

from __future__ import annotations

import math
import re

import pint
from scipy import constants

#: Standard conditions behind sccm and slm.
STANDARD_TEMPERATURE_K = 273.15
STANDARD_PRESSURE_PA = 101325.0

ureg = pint.UnitRegistry(cache_folder=":auto:")   # parsed-definitions cache: 0.16 s -> 0.03 s
ureg.define("@alias torr = Torr")

ureg.define(
    "standard_cubic_centimeter_per_minute = "
    "101325 Pa * cm**3 / (molar_gas_constant * 273.15 K) / minute = sccm")
ureg.define("molar_standard_liter_per_minute = 1000 * sccm = slm_std")
pint.set_application_registry(ureg)
Q_ = ureg.Quantity

#: 1 sccm in mol/s, from the definition above.
SCCM_MOL_S = STANDARD_PRESSURE_PA * 1e-6 / (constants.R * STANDARD_TEMPERATURE_K) / 60.0


class UnitProblem(ValueError):
    """A value that is not a quantity of the expected kind; the message is for the engineer."""


# kind -> (pint dimensionality, SI unit, human label, example)
KINDS: dict[str, tuple[str, str, str, str]] = {
    "pressure": ("[pressure]", "Pa", "a pressure", '"2 Torr" or "250 Pa"'),
    "temperature": ("[temperature]", "K", "a temperature", '"350 degC" or "623 K"'),
    "length": ("[length]", "m", "a length", '"45 nm" or "2.4 um"'),
    "time": ("[time]", "s", "a time", '"0.15 s" or "20 ms"'),
    "flow": ("[substance] / [time]", "mol/s", "a gas flow", '"50 sccm" or "2 slm"'),
    "volume": ("[length] ** 3", "m**3", "a volume", '"9 L" or "0.009 m^3"'),
    "speed": ("[length] ** 3 / [time]", "m**3/s", "a pumping speed", '"1100 L/s"'),
    "density": ("1 / [length] ** 3", "1/m**3", "a number density", '"1e10 cm^-3"'),
    "voltage": ("[electric_potential]", "V", "a voltage", '"300 V"'),
    "energy_eV": ("[energy]", "eV", "an energy or temperature in eV", '"3 eV"'),
    "area": ("[length] ** 2", "m**2", "an area", '"1e-19 m^2" or "100 A^2"'),
    "areal_density": ("1 / [length] ** 2", "1/m**2", "a surface density", '"4e14 cm^-2"'),
}

_NUMBER_UNIT = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?|[-+]?inf|nan)\s*(.*?)\s*$",
                          re.IGNORECASE)
_SLM = re.compile(r"\bslm\b")
_ANGSTROM = re.compile(r"(?<![A-Za-z_])A(?![A-Za-z_])")
#: kinds in which a bare "A" means angstrom (as engineers write film thickness), not ampere
_ANGSTROM_KINDS = {"length", "area", "areal_density", "density"}


def parse_quantity(value: object, kind: str) -> float:
    """Parse ``"<number> <unit>"`` and return the SI float for a quantity of ``kind``.

    Raises :class:`UnitProblem` with a message naming the expected kind and an example; catches every
    exception pint may raise on odd unit strings (see ``ECOSYSTEM.md`` section 2).
    """
    dim, si_unit, label, example = KINDS[kind]
    if isinstance(value, bool) or not isinstance(value, str):
        if isinstance(value, (int, float)):
            raise UnitProblem(f"expected {label} with its unit such as {example}, "
                              f"got the bare number {value!r}")
        raise UnitProblem(f"expected {label} as a string such as {example}, "
                          f"got {type(value).__name__} {value!r}")
    match = _NUMBER_UNIT.match(value)
    if not match:
        raise UnitProblem(f'expected "<number> <unit>" such as {example}, got {value!r}')
    number = float(match.group(1))
    unit_text = _SLM.sub("slm_std", match.group(2))
    if kind in _ANGSTROM_KINDS:
        unit_text = _ANGSTROM.sub("angstrom", unit_text)
    if not math.isfinite(number):
        raise UnitProblem(f"expected a finite number, got {value!r}")
    if not unit_text:
        raise UnitProblem(f"expected {label} with its unit such as {example}, got {value!r} "
                          "(no unit)")
    if kind == "temperature" and unit_text in ("C", "F"):
        electric = {"C": "the coulomb", "F": "the farad"}[unit_text]
        raise UnitProblem(f"{value!r}: here {unit_text} would be {electric}; write "
                          f"deg{unit_text} (e.g. \"350 deg{unit_text}\") or K")
    try:
        unit = ureg.Unit(unit_text)
    except Exception:  # pint raises several unrelated exception types on malformed units
        raise UnitProblem(f"unknown unit {match.group(2)!r} in {value!r} (e.g. {example})") from None
    try:
        quantity = Q_(number, unit)
        if kind == "energy_eV" and quantity.check("[temperature]"):
            # an electron temperature given in kelvin: T[eV] = k T / e
            return float(quantity.to("K").magnitude * constants.k / constants.e)
        if not quantity.check(dim):
            found = _describe_dimension(quantity)
            if kind == "pressure" and quantity.check("[magnetic_field]"):
                found += "; T is the tesla: write Torr or mTorr"
            raise UnitProblem(f"expected {label} such as {example}, got {value!r} ({found})")
        si = quantity.to(si_unit).magnitude
    except UnitProblem:
        raise
    except Exception:
        raise UnitProblem(f"cannot read {value!r} as {label} (e.g. {example})") from None
    return float(si)


def _describe_dimension(quantity) -> str:
    for _, (dim, _, label, _) in KINDS.items():
        if quantity.check(dim):
            return label
    if quantity.dimensionless:
        return "dimensionless"
    if quantity.check("[magnetic_field]"):
        return "a magnetic flux density"
    return f"dimension {quantity.dimensionality}"
