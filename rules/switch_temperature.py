from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden.model import stress
from packwarden.model import JUNCTION_LIMIT
from packwarden import Q
from packwarden import Field

from ._rdsfit import on_resistance_fit, on_resistance_text, parallel_fits


class Options(RuleOptions):
    limit: Q("°C") = Field(JUNCTION_LIMIT, description=(
        "highest junction temperature allowed in service, below the part's own tj_max "
        "[practice: commercial derating, T_J ≤ 125 °C]"))
    steady_after: Q("s") = Field(10.0, description=(
        "a peak this long or longer is judged as a steady state; a shorter one only warns, "
        "because its steady-state junction temperature is an upper bound [practice: "
        "junction-to-ambient time constants of small board-mounted packages are tens of seconds]"))


CASES = {
    "continuous": "the continuous load",
    "peak": "the peak load",
    "permitted": "the highest current the over-current protection permits indefinitely",
}


@rule(id="switch-temperature",
      summary="switch junctions stay cool at the load, the peak and the highest permitted current",
      severity=Severity.error, options=Options, example=Example(
          bad="Q1: {kind: fet_pair_common_drain, theta_ja: 200 K/W, ...}   # 178 °C just below "
              "the trip",
          good="Q1: {part: OR-FET-D20, ...}   # 83 K/W: 116 °C just below the trip"))
def check(ctx, options):
    """A protection FET dissipates I²·R_DS(on) in each channel; at the highest ambient its junction
    sits at T_A + P·R_θJA, and R_DS(on) rises with that temperature, so the balance is solved
    self-consistently (no balance at or below tj_max is thermal runaway). Three currents matter:
    the continuous load, the peak load (as a steady state, an upper bound for a short peak), and
    the worst the protection lets flow for ever — just below the over-current trip, where the
    dissipation is the detection voltage squared over the sense resistance. That last one is the
    FET that cooks at a load the protection happily permits: lowering R_DS(on) raises the
    permitted current and makes it worse, while a lower detection voltage or a lower θJA helps.
    Each junction must stay below the limit option and the part's tj_max. Where the protector
    senses across these switches, the hint's on-resistance alternative is the range of
    trip-current-window's fitted hint (every rule passes over it, or it is empty and says why),
    never a one-sided cut, beside the θJA that would do."""
    m = ctx.model
    for h in m.switch_heat:
        part = h.part
        ceiling = m.limits.junction_ceiling(part)
        if not h.runaway and h.tj <= ceiling:
            continue
        path = ctx.part_path(h.package)
        what = CASES[h.case]
        if h.case == "peak":
            what = f"{what} {fq(h.current, 'A')} for {fq(h.duration, 's')}"
        elif h.case == "continuous":
            what = f"{what} {fq(h.current, 'A')}"
        else:
            what = f"{what} ({fq(h.current, 'A')})"
        severity = None
        bound = ""
        if h.case == "peak" and h.duration < options.steady_after:
            severity = "warning"
            bound = (f" — a steady-state bound: a {fq(h.duration, 's')} peak heats less; check it "
                     f"against the data sheet's transient thermal impedance")
        per = ", ".join(f"{n} {fq(i, 'A')} at {fq(h.rds[n], 'Ω')}" for n, i in h.channel_current.items())
        where = (f"at {h.ambient:.0f} °C ambient, {fq(h.vgs, 'V')} gate drive, {h.corner} "
                 f"on-resistance ({per})")
        figures = [Figure("junction temperature", h.tj, "°C"), Figure("dissipation", h.power, "W"),
                   Figure("theta_ja", part.theta_ja, "K/W"), Figure("ambient", h.ambient, "°C"),
                   Figure("pack current", h.current, "A"), Figure("limit", ceiling, "°C")]
        at_limit = stress.dissipation_at(m, h, ceiling)
        budget = (ceiling - h.ambient) / at_limit if at_limit > 0 else float("inf")
        if h.runaway:
            message = (f"{h.package} runs away thermally at {what} {where}: no steady state at or "
                       f"below its tj_max {fq(part.tj_max, '°C')} (estimate passed "
                       f"{fq(h.tj, '°C')} at {fq(h.power, 'W')})")
        else:
            if h.tj > part.tj_max:
                limit_text = f"its tj_max {fq(part.tj_max, '°C')}"
            else:
                limit_text = (f"the {fq(m.limits.junction, '°C')} limit (tj_max "
                              f"{fq(part.tj_max, '°C')})")
            message = (f"{h.package} junction reaches {fq(h.tj, '°C')} at {what} {where}: "
                       f"{fq(h.power, 'W')} in {fq(part.theta_ja, 'K/W')}, above {limit_text}")
        yield ctx.finding(message + bound, path=path, element=h.package, key=h.case,
                          assumptions=h.assumptions,
                          headline="junction temperature",
                          severity=severity, figures=figures,
                          hint=_fitted_hint(ctx, h, budget) or _hint(h, budget, ceiling))


def _theta_hint(budget):
    if 0 < budget < THETA_JA_FLOOR:
        return _below_floor(budget)
    return (f"a package or copper area with θJA ≤ {fq(budget, 'K/W')}" if budget > 0
            else "a cooler location (the ambient alone uses up the budget)")


def _fitted_hint(ctx, h, budget):
    """Where the protector senses across these switches, the on-resistance alternative is the
    range every rule allows (:mod:`._rdsfit`), not a one-sided cut: less R_DS(on) also raises the
    current the protection permits. None where no search runs."""
    found = on_resistance_fit(ctx)
    if found is None or h.package not in found.packages:
        return None
    pair = ", or a second pair in parallel" if parallel_fits(found) else ""
    joined = "; or " if found.interval is not None else "; "
    return f"{_theta_hint(budget)}{pair}{joined}{on_resistance_text(ctx, found)}"


def _hint(h, budget, ceiling):
    if 0 < budget < THETA_JA_FLOOR:
        return _no_package(h, budget)
    theta = _theta_hint(budget)
    if h.case == "permitted":
        return (f"{theta}, or a protector with a lower over-current detection voltage (the "
                f"dissipation at the trip scales with its square); lower R_DS(on) alone raises the "
                f"permitted current and the heat with it")
    # The rise is about proportional to R_DS(on) at a fixed current; the hotter junction also
    # raises R, so this is the least reduction needed, not a guarantee.
    if h.runaway or h.tj <= h.ambient:
        return f"{theta}, or FETs with much lower R_DS(on), or a second pair in parallel"
    cut = max(0.0, 1.0 - (ceiling - h.ambient) / (h.tj - h.ambient)) * 100
    return (f"{theta}, or FETs with R_DS(on) at least {cut:.0f} % lower, or a second pair in "
            f"parallel")


#: The lowest junction-to-ambient thermal resistance a single power package reaches, K/W: bolted
#: to a large heatsink with forced air, θJC (about 0.5 K/W) + the mounting interface (about
#: 0.5 K/W) + the heatsink (about 1.5 K/W) [memory: power FET data sheets' thermal tables and
#: heatsink makers' curves; on board copper alone it is tens of K/W]. A hint asking for less names
#: no package at all (docs/references.md).
THETA_JA_FLOOR = 2.5


def _below_floor(budget):
    return (f"no package fixes it: θJA ≤ {fq(budget, 'K/W')} is below the about "
            f"{fq(THETA_JA_FLOOR, 'K/W')} a power package reaches even bolted to a heatsink with "
            f"forced air [memory]")


def _no_package(h, budget):
    """The hint when the θJA the junction needs is below what any package reaches: the structure
    must change (issue 18 item 2: an empty range names the structural change)."""
    need = _below_floor(budget)
    if h.case == "permitted":
        return (f"{need}; a protector with a lower over-current detection voltage (the "
                f"dissipation at the trip scales with its square), or FET packages in parallel")
    return f"{need}; FET packages in parallel, or FETs with much lower R_DS(on)"
