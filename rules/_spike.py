"""What keeps a turn-off spike within a switch's limit, in a hint's words: shared by
switch-voltage-margin (the derated limit) and short-circuit-stress, so the two propose one value."""

from packwarden import format_quantity as fq


def spike_within(spike, limit):
    """The wiring inductance or the turn-off time that keeps the turn-off spike within ``limit``
    (volts), in words, or "" when the stack alone reaches it. Both are fields of the format
    (``pack.wiring_inductance``, the FET's ``turn_off_time``), rounded so the figure shown meets
    the limit; short-circuit-stress proposes the same values."""
    room = limit - spike.stack
    if room <= 0:
        return ""
    return (f"keep pack.wiring_inductance ≤ {fq(room * spike.turn_off_time / spike.current, 'H', toward='down')} "
            f"(shorter, twisted or paired leads), or FETs with turn_off_time ≥ "
            f"{fq(spike.inductance * spike.current / room, 's', toward='up')} (a gate resistor "
            f"slows the turn-off; the slower fall heats the FET for longer: switch-pulse-heat)")
