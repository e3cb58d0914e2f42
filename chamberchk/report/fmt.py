"""Display formatting of SI floats with the units engineers read (Torr, nm, sccm, ...).

Only the report layer formats numbers; every function returns text with its unit.
"""

from __future__ import annotations

import math

from ..units import SCCM_MOL_S

TORR_PA = 101325.0 / 760.0


def sig(x: float | None, digits: int = 3) -> str:
    """``x`` to ``digits`` significant figures, plain or scientific as reads best."""
    if x is None or (isinstance(x, float) and not math.isfinite(x)):
        return "n/a"
    if x == 0:
        return "0"
    exponent = math.floor(math.log10(abs(x)))
    if -3 <= exponent < 6:
        decimals = max(digits - 1 - exponent, 0)
        return f"{x:.{decimals}f}"
    return f"{x:.{digits - 1}e}".replace("e-0", "e-").replace("e+0", "e").replace("e+", "e")


def _scaled(x: float | None, scales: list[tuple[float, str]], zero_unit: str | None = None
            ) -> str:
    if x is None:
        return "n/a"
    if x == 0:
        return f"0 {zero_unit or scales[0][1]}"
    for factor, unit in scales:
        if abs(x) >= factor:
            return f"{sig(x / factor)} {unit}"
    factor, unit = scales[-1]
    return f"{sig(x / factor)} {unit}"


def length(x_m):
    # a zero length is a film or etch depth that a step does not have: say it at feature scale
    return _scaled(x_m, [(1e-3, "mm"), (1e-6, "µm"), (1e-9, "nm"), (1e-10, "Å")], "nm")


def pressure(p_pa):
    if p_pa is None:
        return "n/a"
    torr = p_pa / TORR_PA
    main = f"{sig(torr)} Torr" if torr >= 1 else (f"{sig(torr * 1e3)} mTorr" if torr >= 1e-3
                                                    else f"{sig(torr)} Torr")
    return f"{main} ({sig(p_pa)} Pa)"


def temperature(t_k):
    return "n/a" if t_k is None else f"{t_k - 273.15:.1f} °C ({sig(t_k, 5)} K)"


def time(t_s):
    return _scaled(t_s, [(1.0, "s"), (1e-3, "ms"), (1e-6, "µs"), (1e-9, "ns")])


def speed(v):
    return "n/a" if v is None else f"{sig(v)} m/s"


def diffusivity(d):
    return "n/a" if d is None else f"{sig(d * 1e4)} cm²/s"


def flow(mol_s):
    return "n/a" if mol_s is None else f"{sig(mol_s / SCCM_MOL_S)} sccm"


def throughput(q):
    return "n/a" if q is None else f"{sig(q)} Pa·m³/s"


def pump_speed(s):
    return "n/a" if s is None else f"{sig(s * 1e3)} L/s"


def viscosity(mu):
    return "n/a" if mu is None else f"{sig(mu * 1e6)} µPa·s"


def exposure(pt):
    return "n/a" if pt is None else f"{sig(pt)} Pa·s ({sig(pt / TORR_PA * 1e6)} L)"


def number(x):
    return sig(x)


def percent(x):
    return "n/a" if x is None else f"{sig(100 * x)} %"


def volume(v):
    return "n/a" if v is None else f"{sig(v * 1e3)} L"


def text(value):
    if value is None:
        return "absent"
    if isinstance(value, list):
        return ", ".join(text(v) for v in value) or "none"
    if isinstance(value, dict):
        return "; ".join(f"{k} {text(v)}" for k, v in value.items())
    if isinstance(value, float):
        return sig(value)
    return str(value)


_KINDS = {"pressure": pressure, "time": time, "temperature": temperature, "length": length,
          "flow": flow, "number": sig, "volume": volume, "speed": pump_speed, "text": text}


_SUFFIXES = ("_Pa_m3_s", "_m3_s", "_m2_s", "_m_s", "_Pa", "_K", "_s", "_m3", "_m")


def field_label(name: str) -> str:
    """``pressure_Pa`` -> ``pressure``; ``feature_ids`` -> ``features``."""
    for suffix in _SUFFIXES:
        if name.endswith(suffix):
            name = name[: -len(suffix)]
            break
    return {"feature_ids": "features"}.get(name, name).replace("_", " ")


def by_kind(value, kind: str) -> str:
    """Format ``value`` with the formatter for ``kind`` (comparison tables); None is 'absent'."""
    return "absent" if value is None else _KINDS.get(kind, text)(value)


FILTERS = {name: globals()[name] for name in (
    "volume", "text", "by_kind", "field_label",
    "sig", "length", "pressure", "temperature", "time", "speed", "diffusivity", "flow",
    "throughput", "pump_speed", "viscosity", "exposure", "number", "percent")}
