"""What keeps a turn-off spike within a switch's limit, in a hint's words: shared by
switch-voltage-margin (the derated limit) and short-circuit-stress, so the two propose one value."""

from packwarden import format_quantity as fq


def spike_within(spike, limit, window=None):
    """The wiring inductance or the turn-off time that keeps the turn-off spike within ``limit``
    (volts), in words, or "" when the stack alone reaches it. Both are fields of the format
    (``pack.wiring_inductance``, the FET's ``turn_off_time``), rounded so the figure shown meets
    the limit; short-circuit-stress proposes the same values. ``window`` (the model's
    ``turn_off_window``) bounds the turn-off time from above too: a slower fall heats the FET
    for longer, so only a time inside it is proposed, and an empty window is said."""
    room = limit - spike.stack
    if room <= 0:
        return ""
    low = window.low if window is not None else spike.inductance * spike.current / room
    lead = (f"keep pack.wiring_inductance ≤ {fq(room * spike.turn_off_time / spike.current, 'H', toward='down')} "
            f"(shorter, twisted or paired leads), or ")
    if window is None or window.high is None:
        return lead + (f"FETs with turn_off_time ≥ {fq(low, 's', toward='up')} (a gate resistor "
                       f"slows the turn-off; the slower fall heats the FET for longer: "
                       f"switch-pulse-heat)")
    # 2 % apart at least, so that the two ends, each rounded inward to three digits, stay ordered
    if window.high < low * 1.02:
        return lead + (f"FETs of a higher vds_max or a lower Z_th: no turn_off_time fits, since "
                       f"≥ {fq(low, 's', toward='up')} keeps the spike within the limit but "
                       f"{window.package} passes its tj_max turning off in more than "
                       f"{fq(window.high, 's', toward='down')} (switch-pulse-heat)")
    return lead + (f"FETs with turn_off_time ≥ {fq(low, 's', toward='up')} and ≤ "
                   f"{fq(window.high, 's', toward='down')} (a gate resistor slows the turn-off; "
                   f"a slower one heats {window.package} past its tj_max: switch-pulse-heat)")
