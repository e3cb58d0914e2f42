"""The rules' vocabulary: each flag code with its severity and the caution an engineer reads.

Codes are short kebab-case words of our own. The evaluator raises flags with :func:`raise_flag`;
reports and the CLI's ``--fail-on`` read the severity.
"""

from __future__ import annotations

from dataclasses import dataclass

SEVERITIES = ("info", "warning", "critical")


@dataclass(frozen=True)
class Rule:
    severity: str
    caution: str


RULES: dict[str, Rule] = {
    "regime-shift": Rule(
        "warning",
        "The gas in this feature behaves differently from the previous step: transport and "
        "coverage scale with pressure and width in a different way across a regime bound, so "
        "results tuned at one step do not carry over."),
    "regime-crossing": Rule(
        "warning",
        "The change moves this feature into another flow regime: transport, fill time and "
        "coverage respond differently to pressure, temperature and width than before. Requalify "
        "the step rather than carrying over results from the old recipe."),
    "feature-closes": Rule(
        "critical",
        "The film deposited so far closes the feature; later steps cannot reach below the "
        "pinch-off point and a void or seam is likely."),
    "reactant-regime": Rule(
        "info",
        "The reactant's own mean free path in this mixture puts it in another regime than the "
        "mixture as a whole (a heavy precursor in a light carrier, or the reverse). Regime "
        "labels and the choice of coverage model follow the mixture; diffusivities and fill "
        "times use the reactant's own figures."),
    "gas-hazard": Rule(
        "info",
        "Hazardous gas in use: follow the supplier's safety data sheet and site gas-handling "
        "rules."),
    "estimated-gas-data": Rule(
        "info",
        "No published Lennard-Jones parameters exist for this gas; viscosity, mean free path and "
        "diffusivity use an estimate from critical constants and may be off by 10-30 %."),
    "model-range": Rule(
        "warning",
        "A model is used outside the range its authors fitted or derived it for; treat the "
        "affected figures as rough."),
    "fill-slower-than-step": Rule(
        "warning",
        "The reactant needs longer than the step to reach 99 % of its opening concentration at "
        "the bottom of this feature: the bottom sees less than the top."),
    "poor-bottom-coverage": Rule(
        "warning",
        "Little of the reactant flux reaches the bottom of this feature; expect thinner film (or "
        "slower etch) at the bottom than at the top."),
    "dose-short": Rule(
        "warning",
        "The pulse's exposure is below what the feature needs to saturate (Gordon et al. 2003); "
        "the bottom of the feature may not saturate in this pulse. The closed form itself is up "
        "to 12 % optimistic, so a margin just above 1 is thin too."),
    "pressure-unreachable": Rule(
        "critical",
        "The pumping path cannot hold this pressure at this flow with the pump at full speed; "
        "the chamber will sit higher than the recipe asks."),
    "short-residence": Rule(
        "warning",
        "The step is short compared with the time the chamber needs to exchange its gas; the "
        "gas composition will not settle within the step."),
    "gap-mixing": Rule(
        "info",
        "Gas leaves the chamber faster than it diffuses across the wafer gap (Peclet number above "
        "1): the composition at the wafer may differ from the inlet mix."),
    "sheath-collisional": Rule(
        "warning",
        "Ions collide in the sheath: their angles spread and fewer reach the bottom of deep "
        "features, so profiles may bow or taper."),
    "neutral-starved": Rule(
        "warning",
        "Neutral radicals reaching the bottom fall short of the ions there: the etch at the "
        "bottom becomes limited by neutral supply (aspect-ratio-dependent etching)."),
}


@dataclass(frozen=True)
class Flag:
    code: str
    severity: str
    step: str | None
    feature: str | None
    message: str
    caution: str


def raise_flag(code: str, message: str, step: str | None = None, feature: str | None = None,
               severity: str | None = None) -> Flag:
    """Build a :class:`Flag` for a known code; ``severity`` overrides the rule's default."""
    rule = RULES[code]
    return Flag(code, severity or rule.severity, step, feature, message, rule.caution)


def severity_rank(severity: str) -> int:
    return SEVERITIES.index(severity)
