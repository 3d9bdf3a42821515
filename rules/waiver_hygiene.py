from packwarden import Example, Severity, rule


# Netlist scope: the findings come from the engine's waiver pass, which runs even while the
# netlist has integrity errors, so the rule is never listed as held back.
@rule(id="waiver-hygiene", scope="netlist",
      summary="every waiver is still in date and matches a finding",
      severity=Severity.error, example=Example(
          bad="waivers:\n"
              "  - rule: trip-current-window\n"
              "    element: U1\n"
              "    reason: bench-tested at 2.6 A for 10 min, test report TR-114\n"
              "    expires: 2020-06-30        # past: the finding counts again",
          good="waivers:\n"
               "  - rule: trip-current-window\n"
               "    element: U1\n"
               "    reason: bench-tested at 2.6 A for 10 min, test report TR-114\n"
               "    approved_by: hw-review\n"
               "    expires: 2099-06-30"))
def check(ctx, options):
    """A waiver accepts a finding on the record: which rule, which element, why, who approved it and
    until when. Its findings are reported as waived and do not fail the run. A waiver that has
    expired waives nothing, and is itself an error, so an accepted risk is looked at again rather
    than forgotten. A waiver that matches no finding is a warning: the finding was fixed or the
    waiver names the wrong rule or element, and a stale waiver would silently cover a later
    finding. A waiver without a reason is not valid at all (an input error). A waiver may bound
    what it accepts (``up_to: 1.5 A`` on the finding's headline figure, or ``down_to: 1.2 A``
    where the finding worsens as that figure falls): a finding beyond the bound is not waived
    and says which waiver does not cover it; the waiver still counts as matching, so it is not
    called unused. A group of parallel packages is waived only when each
    member is (docs/output-formats.md, "One cause, one finding").

    The engine emits these findings itself, after every rule has run (``packwarden.waivers``), so
    this check yields nothing: the rule is registered so that its id, rationale and example
    appear in ``packwarden rules``, the rule reference and the rule list of SARIF reports."""
    return ()
