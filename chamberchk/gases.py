"""Gas properties: the shipped table ``data/gases.toml`` plus gases a recipe adds or overrides."""

from __future__ import annotations

import difflib
import tomllib
from dataclasses import dataclass
from functools import lru_cache
from importlib import resources
from types import MappingProxyType
from typing import Mapping

HAZARD_CLASSES = ("pyrophoric", "flammable", "toxic", "corrosive", "oxidizer", "water-reactive",
                  "asphyxiant")

#: Fields of one gas row: name -> (python type, required)
GAS_FIELDS: dict[str, tuple[type, bool]] = {
    "name": (str, True),
    "aliases": (list, False),
    "molar_mass_g_mol": (float, True),
    "lj_sigma_A": (float, True),
    "lj_epsilon_K": (float, True),
    "lj_estimated": (bool, False),
    "inert": (bool, False),
    "hazards": (list, False),
    "caution": (str, False),
    "source": (str, True),
}


@dataclass(frozen=True)
class Gas:
    """One gas, in SI units, with its hazard classes and the source of its data."""

    key: str
    name: str
    molar_mass_kg_mol: float
    sigma_m: float
    epsilon_K: float
    lj_estimated: bool
    inert: bool
    hazards: tuple[str, ...]
    caution: str
    source: str


@dataclass(frozen=True)
class Hazard:
    key: str
    label: str
    caution: str


class GasTable:
    """Case-exact lookup of gases by key or alias, with close-match suggestions on a miss."""

    def __init__(self, gases: Mapping[str, Gas], aliases: Mapping[str, str],
                 hazards: Mapping[str, Hazard]):
        self.gases = MappingProxyType(dict(gases))
        self.aliases = MappingProxyType(dict(aliases))
        self.hazards = MappingProxyType(dict(hazards))

    def __contains__(self, name: str) -> bool:
        return name in self.gases or name in self.aliases

    def get(self, name: str) -> Gas:
        key = self.aliases.get(name, name)
        return self.gases[key]

    def suggest(self, name: str) -> list[str]:
        names = list(self.gases) + list(self.aliases)
        close = difflib.get_close_matches(name, names, n=3, cutoff=0.6)
        folded = [n for n in names if n.lower() == name.lower()]
        return list(dict.fromkeys(folded + close))

    def with_overrides(self, gases: Mapping[str, Gas]) -> "GasTable":
        merged = dict(self.gases)
        merged.update(gases)
        aliases = {a: k for a, k in self.aliases.items() if a not in gases}
        return GasTable(merged, aliases, self.hazards)


def gas_from_row(key: str, row: Mapping) -> Gas:
    """Build a :class:`Gas` from a validated table row (units in the field names)."""
    return Gas(
        key=key,
        name=row["name"],
        molar_mass_kg_mol=float(row["molar_mass_g_mol"]) * 1e-3,
        sigma_m=float(row["lj_sigma_A"]) * 1e-10,
        epsilon_K=float(row["lj_epsilon_K"]),
        lj_estimated=bool(row.get("lj_estimated", False)),
        inert=bool(row.get("inert", False)),
        hazards=tuple(row.get("hazards", ())),
        caution=str(row.get("caution", "")),
        source=str(row["source"]),
    )


@lru_cache(maxsize=1)
def shipped_table() -> GasTable:
    """The gas table shipped with the package."""
    text = resources.files("chamberchk").joinpath("data/gases.toml").read_text(encoding="utf-8")
    doc = tomllib.loads(text)
    gases: dict[str, Gas] = {}
    aliases: dict[str, str] = {}
    for key, row in doc["gas"].items():
        gases[key] = gas_from_row(key, row)
        for alias in row.get("aliases", []):
            aliases[alias] = key
    hazards = {k: Hazard(k, v["label"], v["caution"]) for k, v in doc["hazard"].items()}
    return GasTable(gases, aliases, hazards)
