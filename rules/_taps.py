"""Shared by the rules that judge a multi-cell part's cell sense pins (threshold-ladder,
backup-overvoltage): a pin on the wrong tap of the stack."""

from __future__ import annotations

from typing import Iterable, Iterator

from packwarden import Finding, RuleContext


def wrong_taps(ctx: RuleContext, refdes: str, taps: Iterable[tuple], base: tuple,
               consequence: str) -> Iterator[Finding]:
    """A finding for each (pin, net, level reached, level wanted) whose pin misses its tap;
    ``base`` is the component's YAML path, ``consequence`` what the wrong tap does."""
    for pin, net, reached, want in taps:
        if reached == want:
            continue
        where = "no tap of the stack" if reached is None else (
            "the stack's bottom" if reached == 0 else f"the top of cell {reached}")
        yield ctx.finding(
            f"{refdes}.{pin} senses net {net}, {where}, but {pin} must sense the top of cell "
            f"{want} from the bottom: {consequence}",
            path=base + ("pins", pin), element=refdes, key=f"tap-{pin}",
            hint=f"connect {pin} to the net at the top of cell {want} (cell1 is the bottom cell)")
