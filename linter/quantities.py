"""Strict engineering-value parsing, per field and unit.

Data sheets write values as ``22 mΩ`` or ``3 µA``; design files copy them. The number and its SI
prefix are read as quantiphy reads them (quantiphy itself is imported only for a number with an
exponent); this wrapper decides what is acceptable. Anything a reviewer could read two ways is
refused with a message that names the expected unit, never guessed:

* RKM codes (``4k7``, ``5V5``) - a schematic habit, but ``5V5`` in a threshold field is a typo magnet;
* decimal commas (``1,5 V``) - 1.5 or 15 depending on the author's locale;
* ``meg`` - SPICE's mega, but milli to everyone else;
* NaN and infinity - no physical part has them.
"""

from __future__ import annotations

import math
import re
import unicodedata

from .records import record


class QuantityError(ValueError):
    """A value that is not an acceptable engineering quantity for its field."""


@record(frozen=True)
class Unit:
    """A unit a field accepts: its canonical symbol, accepted spellings and a human name."""

    symbol: str
    name: str
    spellings: tuple[str, ...] = ()
    #: SI prefixes make no sense on some units (percent, degrees Celsius, K/W).
    prefixes: bool = True
    #: Lower physical bound, inclusive; None where negative values are meaningful.
    minimum: float | None = None
    #: Whether the value must be strictly above ``minimum``.
    exclusive: bool = False


# Spellings map to canonical symbols after NFKC normalisation, which already folds the Ohm sign
# U+2126 into Greek capital omega U+03A9 and the micro sign U+00B5 into Greek mu U+03BC: both pairs
# look the same on screen and data sheets use either, so both are accepted as the same thing.
UNITS: dict[str, Unit] = {
    "V": Unit("V", "volts"),
    "A": Unit("A", "amperes"),
    "Ω": Unit("Ω", "ohms", ("ohm", "ohms", "Ohm"), minimum=0.0),
    "F": Unit("F", "farads", minimum=0.0),
    "H": Unit("H", "henries", minimum=0.0),
    "W": Unit("W", "watts", minimum=0.0),
    "J": Unit("J", "joules", minimum=0.0),
    "s": Unit("s", "seconds", ("sec",), minimum=0.0),
    "Ah": Unit("Ah", "ampere-hours", minimum=0.0, exclusive=True),
    "%": Unit("%", "percent", prefixes=False),
    "°C": Unit("°C", "degrees Celsius", ("degC", "℃"), prefixes=False, minimum=-273.15),
    "K": Unit("K", "kelvin (temperature difference)", prefixes=False),
    "K/W": Unit("K/W", "kelvin per watt", ("°C/W", "degC/W"), prefixes=False, minimum=0.0,
                exclusive=True),
    "A²s": Unit("A²s", "ampere-squared seconds", ("A2s", "A^2s", "A^2 s", "A²·s", "A^2·s"),
                minimum=0.0),
    "m": Unit("m", "metres", minimum=0.0),
    "oz": Unit("oz", "ounces of copper per square foot", ("oz/ft2", "oz/ft²"), prefixes=False,
               minimum=0.0, exclusive=True),
    "months": Unit("months", "months", ("month",), prefixes=False, minimum=0.0),
    "%/month": Unit("%/month", "percent per month", prefixes=False, minimum=0.0),
}

_SPELLING: dict[str, str] = {}
for _unit in UNITS.values():
    _SPELLING[unicodedata.normalize("NFKC", _unit.symbol)] = _unit.symbol
    for _alias in _unit.spellings:
        _SPELLING[unicodedata.normalize("NFKC", _alias)] = _unit.symbol

_PREFIX = {"Y": 1e24, "Z": 1e21, "E": 1e18, "P": 1e15, "T": 1e12, "G": 1e9, "M": 1e6, "k": 1e3,
           "m": 1e-3, "u": 1e-6, "μ": 1e-6, "n": 1e-9, "p": 1e-12, "f": 1e-15, "a": 1e-18}
_EXPONENT = {k: f"e{round(math.log10(v))}" for k, v in _PREFIX.items()}

# A plain decimal number, optional exponent, optional space, then the rest (prefix + unit).
# The number must end where a digit or point cannot follow, or ``4.2  V`` and ``0x10 V`` would be
# read as the number ``4.`` or ``0`` followed by a strange unit.
# Digits are ASCII only ([0-9], not \d): Python's \d and float() also take the digits of other
# scripts, and a Bengali four looks like an 8 (see _foreign_digit).
_SHAPE = re.compile(r"^(?P<num>[+-]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?)"
                    r"(?![0-9.])(?P<sp>\s?)(?P<rest>\S.*)?$")
_RKM = re.compile(r"^(?P<a>[0-9]+)(?P<letter>[RKMGkmunpμVAFΩ])(?P<b>[0-9]+)\s*\S*$")
_RKM_PREFIX = {"R": "", "V": "", "A": "", "F": "", "Ω": "", "K": "k", "u": "μ"}
_WIDE_GAP = re.compile(r"^\S+\s{2,}\S")
_DECIMAL_COMMA = re.compile(r"^[+-]?[0-9]+,[0-9]")
_NONFINITE = re.compile(r"(?i)^[+-]?(nan|inf|infinity|\.inf|\.nan)\b")


def _expected(unit: Unit) -> str:
    return f"{unit.name} ({unit.symbol})"


#: Texts already read, by text and unit: a batch's designs and their libraries write the same
#: values over and over ("4.25 V", "2 mOhm"), each a few microseconds to read. A float is
#: immutable, and a text that fails is read again each time (its error raised anew). Bounded.
_PARSED: dict[tuple[str, str], float] = {}
PARSED_MAX = 16_384


def parse_quantity(text: object, unit: str) -> float:
    """Parse ``text`` as a value in ``unit`` (a key of :data:`UNITS`) and return it in SI units.

    Raises :class:`QuantityError` with a message fit to show the user.
    """
    spec = UNITS[unit]
    if text is None:
        raise QuantityError(f"no value given; expected {_expected(spec)}, e.g. '{example(spec)}'")
    if isinstance(text, bool):
        raise QuantityError(f"expected {_expected(spec)}, e.g. '{example(spec)}'; "
                            f"got the boolean {str(text).lower()}")
    if isinstance(text, (int, float)):
        if spec.symbol in ("%", "°C", "K", "K/W", "months", "%/month") or unit == "oz":
            try:
                value = float(text)
            except OverflowError:  # a YAML integer too large for any float
                raise QuantityError(f"{_short(str(text))} is too large; expected "
                                    f"{_expected(spec)}") from None
        else:
            raise QuantityError(
                f"missing unit: write '{_fmt_number(text)} {spec.symbol}' ({spec.name})")
    elif isinstance(text, str):
        key = (text, unit)
        value = _PARSED.get(key)
        if value is None:
            value = _check_bounds(_parse_text(text, spec), spec)
            if len(_PARSED) >= PARSED_MAX:
                _PARSED.clear()
            _PARSED[key] = value
        return value
    else:
        what = {"dict": "mapping"}.get(type(text).__name__, type(text).__name__)
        raise QuantityError(f"expected {_expected(spec)} as text like '{example(spec)}', "
                            f"got a {what}")
    return _check_bounds(value, spec)


def _parse_text(text: str, spec: Unit) -> float:
    foreign = _foreign_digit(text)
    if foreign is not None:
        raise QuantityError(f"{_q(text)}: {_q(foreign)} is {unicodedata.name(foreign, 'a digit')}"
                            f", not an ASCII digit; write numbers with the digits 0-9")
    raw = unicodedata.normalize("NFKC", text.strip())
    if not raw:
        raise QuantityError(f"empty value; expected {_expected(spec)}")
    if _NONFINITE.match(raw):
        raise QuantityError(f"{_q(text)} is not a finite number; expected {_expected(spec)}")
    if _DECIMAL_COMMA.match(raw):
        raise QuantityError(f"{_q(text)} uses a decimal comma; write a decimal point "
                            f"(e.g. {_q(raw.replace(',', '.', 1))})")
    m = _SHAPE.match(raw)
    rest = (m.group("rest") or "").strip() if m else ""
    found = _unit_of(rest) if rest else None
    rkm = _RKM.match(raw)
    if rkm and found is None:  # `10A2s` is a number and a unit, `4k7` and `5V5` are not
        raise QuantityError(f"{_q(text)} looks like an RKM code; write {_rkm_hint(rkm, spec)}")
    if not m:
        if _WIDE_GAP.match(raw):
            raise QuantityError(f"{_q(text)}: put a single space between the number and the "
                                f"unit, e.g. '{example(spec)}'")
        raise QuantityError(f"{_q(text)} is not a number with a unit; expected "
                            f"{_expected(spec)}, e.g. '{example(spec)}'")
    if not rest:
        if spec.symbol in ("%", "°C", "K", "K/W", "months", "%/month", "oz"):
            value = float(m.group("num"))
            if not math.isfinite(value):
                raise QuantityError(f"{_q(text)} is too large to be a finite number; expected "
                                    f"{_expected(spec)}")
            return value
        raise QuantityError(f"missing unit: write '{m.group('num')} {spec.symbol}' ({spec.name})")
    if rest.lower().startswith("meg"):
        raise QuantityError(f"{_q(text)}: 'meg' is SPICE's mega but reads as milli elsewhere; "
                            f"write 'M' for mega or 'm' for milli")
    if found is None:
        if " " in rest or not (rest[0].isalpha() or rest[0] in "°%℃"):
            raise QuantityError(f"{_q(text)} is not a number with a unit; expected "
                                f"{_expected(spec)}, e.g. '{example(spec)}'")
        hint = _case_hint(rest, spec)
        if hint is None and rest in _PREFIX and spec.prefixes:
            raise QuantityError(f"{_q(text)}: {_q(rest)} is a prefix without a unit; write "
                                f"'{m.group('num')} {rest}{spec.symbol}'")
        raise QuantityError(f"{_q(text)}: unknown unit {_q(rest)}; expected {_expected(spec)}"
                            + (f" (units are case-sensitive: write '{hint}')" if hint else ""))
    prefix, canonical = found
    if canonical != spec.symbol:
        raise QuantityError(f"{_q(text)} is in {UNITS[canonical].name}; expected "
                            f"{_expected(spec)}")
    if prefix and not spec.prefixes:
        raise QuantityError(f"{_q(text)}: {spec.symbol} takes no SI prefix")
    num = m.group("num")
    if "e" not in num and "E" not in num:
        # A plain decimal: quantiphy would read it as float(number + the prefix's exponent);
        # reading it so here is the same value to the last bit (checked over every prefix and
        # a quarter of a million numbers), and spares every run quantiphy's import.
        value = float(num + _EXPONENT[prefix]) if prefix else float(num)
    else:
        from quantiphy import Quantity, QuantiPhyError
        try:
            # quantiphy reads the number and prefix; the unit has been checked above.
            q = Quantity(f"{num}{prefix}" if prefix else num)
        except QuantiPhyError as exc:  # pragma: no cover - the shape regex admits only numbers
            raise QuantityError(f"{_q(text)}: {exc}") from None
        value = float(q)
    if not math.isfinite(value):
        raise QuantityError(f"{_q(text)} is too large to be a finite number; expected "
                            f"{_expected(spec)}")
    return value


def _foreign_digit(text: str) -> str | None:
    """The first digit of another script (or a superscript, a fullwidth or a circled digit) in the
    number, before the unit starts: such digits look like others (a Bengali four like an 8), and
    NFKC or float() would read some of them silently. The unit may hold one (``A²s``)."""
    for c in text:
        if c.isalpha() or c in "°%℃Ω":
            return None
        if c.isnumeric() and not c.isascii():
            return c
    return None


def _unit_of(rest: str) -> tuple[str, str] | None:
    """``(prefix, canonical symbol)`` for the text after the number, or None when it is no unit."""
    canonical = _SPELLING.get(rest)
    if canonical is not None:
        return "", canonical
    prefix, canonical = rest[:1], _SPELLING.get(rest[1:])
    if prefix in _PREFIX and canonical is not None:
        return prefix, canonical
    return None


def _case_hint(rest: str, spec: Unit) -> str | None:
    """The accepted spelling of ``rest`` when only its letter case is wrong: ``mv`` -> ``mV``."""
    spellings = [s for s, c in _SPELLING.items() if c == spec.symbol]
    for sp in spellings:
        if rest.lower() == sp.lower():
            return sp
    if spec.prefixes and len(rest) > 1 and rest[0] in _PREFIX:
        for sp in spellings:
            if rest[1:].lower() == sp.lower():
                return rest[0] + sp
    return None


def _rkm_hint(m: re.Match, spec: Unit) -> str:
    """What an RKM code most likely means, written the accepted way."""
    letter = m.group("letter")
    prefix = _RKM_PREFIX.get(letter, letter)
    if letter in "VAF" and letter != spec.symbol or prefix and not spec.prefixes:
        return f"the value with a decimal point and unit, e.g. '{example(spec)}'"
    return f"'{m.group('a')}.{m.group('b')} {prefix}{spec.symbol}'"


def _q(text: str) -> str:
    """The user's text, quoted, on one line: control characters are shown escaped."""
    shown = "".join(c if c.isprintable() else repr(c)[1:-1] for c in text)
    return f"'{shown[:40]}…'" if len(shown) > 40 else f"'{shown}'"


def _short(text: str) -> str:
    return text if len(text) <= 20 else f"{text[:12]}…({len(text)} digits)"


def _check_bounds(value: float, spec: Unit) -> float:
    if not math.isfinite(value):
        raise QuantityError(f"{value} is not a finite number; expected {_expected(spec)}")
    if spec.minimum is not None:
        low = spec.minimum
        if value < low or (spec.exclusive and value == low):
            # six figures, so -273.16 °C is not shown as the -273 °C it is being compared with
            shown = format_quantity(value, spec.symbol, digits=6)
            if spec.symbol == "°C":
                raise QuantityError(f"{shown} is below absolute zero "
                                    f"({format_quantity(low, spec.symbol, digits=6)})")
            word = "above" if spec.exclusive else "at least"
            raise QuantityError(f"{shown} is out of physics: {spec.name} must be {word} "
                                f"{format_quantity(low, spec.symbol, digits=6)}")
    return value


def example(spec: Unit) -> str:
    return {"V": "4.25 V", "A": "1.2 A", "Ω": "22 mΩ", "F": "100 nF", "H": "500 nH",
            "W": "0.25 W", "J": "5 J", "s": "40 ms", "Ah": "3.4 Ah", "%": "1 %", "°C": "-20 °C",
            "K": "10 K", "K/W": "120 K/W", "A²s": "10 A²s", "m": "2 mm", "oz": "1 oz",
            "months": "12 months", "%/month": "2 %/month"}.get(spec.symbol, f"1 {spec.symbol}")


def _fmt_number(value: float) -> str:
    return f"{value:g}"


def rounded_toward(value: float, digits: int, toward: str) -> float:
    """``value`` at ``digits`` significant figures, rounded up or down (away from the nearest
    only when the nearest would not meet the bound)."""
    nearest = float(f"{value:.{digits}g}")
    if (toward == "up" and nearest >= value) or (toward == "down" and nearest <= value):
        return nearest
    step = 10.0 ** (math.floor(math.log10(abs(value))) - digits + 1)
    return float(f"{nearest + (step if toward == 'up' else -step):.{digits}g}")


_ENG = [(1e9, "G"), (1e6, "M"), (1e3, "k"), (1.0, ""), (1e-3, "m"), (1e-6, "µ"), (1e-9, "n"),
        (1e-12, "p")]


def format_quantity(value: float, unit: str, digits: int = 3, toward: str | None = None) -> str:
    """Format ``value`` (SI) with an engineering prefix and ``digits`` significant figures.

    ``toward`` rounds a bound so that the figure shown still meets it: ``"up"`` for an "at least"
    (a hint's ``≥ 3.14 mm`` for 3.1304 mm), ``"down"`` for an "at most"; the nearest otherwise.
    """
    spec = UNITS.get(unit)
    if not math.isfinite(value):
        return f"{value} {unit}"
    if toward is not None and value != 0:
        value = rounded_toward(value, digits, toward)
    if unit == "months" and 0 < value < 1:
        return _short_duration(value, digits)
    if spec is not None and not spec.prefixes or value == 0:
        return f"{value:.{digits}g} {unit}"
    # Round first, then pick the prefix: 999.96 µV rounds to 1 mV, not to "1e+03 µV".
    rounded = float(f"{value:.{digits}g}")
    for scale, prefix in _ENG:
        if abs(rounded) >= scale * (1 - 1e-12):
            return f"{rounded / scale:.{digits}g} {prefix}{unit}"
    return f"{value:.{digits}g} {unit}"


#: What may stand before a unit's spelling: a number, a space, an SI prefix.
_NUMBER_BEFORE_UNIT = re.compile(r"[0-9.]\s?[YZEPTGMkmunpμaf]?$")


def parse_any_quantity(text: object) -> tuple[float, str]:
    """Parse ``text`` as a value in whichever unit it names: ``(value in SI, unit symbol)``.

    For a value that bounds a figure of any unit (a waiver's ceiling). The unit must be written:
    a bare number could be a percentage or a temperature. Raises :class:`QuantityError`."""
    if not isinstance(text, str) or isinstance(text, bool):
        raise QuantityError("expected a value with its unit, e.g. '1.5 A' or '85 °C'")
    raw = unicodedata.normalize("NFKC", text.strip())
    endings = sorted(((s, u) for s, u in _SPELLING.items()), key=lambda su: -len(su[0]))
    for spelling, unit in endings:
        if raw.endswith(spelling) and _NUMBER_BEFORE_UNIT.search(raw[:-len(spelling)]):
            return parse_quantity(text, unit), unit
    raise QuantityError(f"{_q(text)} names no unit packwarden knows; write a value with its "
                        f"unit, e.g. '1.5 A' or '85 °C' (units: "
                        f"{', '.join(u.symbol for u in UNITS.values())})")


#: The storage budget's month, 730 hours [derived: 8760 h / 12], as ``model.events`` counts it.
_HOURS_PER_MONTH = 730.0


def _short_duration(months: float, digits: int) -> str:
    """Less than a month, as a reader counts it: days, or hours below a day."""
    hours = months * _HOURS_PER_MONTH
    if hours >= 24 * (1 - 1e-12):
        return f"{hours / 24:.{digits}g} days"
    return f"{hours:.{digits}g} hours"
