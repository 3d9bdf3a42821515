"""Engineering values: every accepted form, and every refused form with its exact message.

Outside facts checked here, with their sources:

* SI prefixes (k = 1e3, m = 1e-3, µ = 1e-6, n = 1e-9, M = 1e6): BIPM, The International System of
  Units (SI Brochure, 9th edition, 2019), table 7.
* Absolute zero is 0 K = -273.15 °C: SI Brochure, 9th edition, section 2.3.1 (the Celsius
  temperature is defined as T - 273.15 K).
* U+00B5 MICRO SIGN is a compatibility equivalent of U+03BC GREEK SMALL LETTER MU, and U+2126 OHM
  SIGN a canonical equivalent of U+03A9 GREEK CAPITAL LETTER OMEGA: Unicode Character Database,
  UnicodeData.txt (decomposition fields of U+00B5 and U+2126).
* RKM codes (4k7 = 4.7 kΩ, 5V5 = 5.5 V, 4R7 = 4.7 Ω): IEC 60062:2016, section 4 (letter and
  digit code for resistance and capacitance values).
"""

import math
import unicodedata

import pytest
from hypothesis import given, settings, strategies as st

from packwarden.quantities import UNITS, QuantityError, format_quantity, parse_quantity

MICRO_SIGN, GREEK_MU = "\u00b5", "\u03bc"
OHM_SIGN, GREEK_OMEGA = "\u2126", "\u03a9"


def test_the_look_alike_characters_are_what_the_tests_think():
    # UnicodeData.txt [published]: the names, and the equivalences the parser relies on.
    assert unicodedata.name(MICRO_SIGN) == "MICRO SIGN"
    assert unicodedata.name(GREEK_MU) == "GREEK SMALL LETTER MU"
    assert unicodedata.name(OHM_SIGN) == "OHM SIGN"
    assert unicodedata.name(GREEK_OMEGA) == "GREEK CAPITAL LETTER OMEGA"
    assert MICRO_SIGN != GREEK_MU and OHM_SIGN != GREEK_OMEGA


# --- accepted ------------------------------------------------------------------------------------

ACCEPTED = [
    ("4.25 V", "V", 4.25),
    ("22 mΩ", "Ω", 22e-3),
    ("22 mohm", "Ω", 22e-3),
    ("2.0 kΩ", "Ω", 2.0e3),
    ("1 MΩ", "Ω", 1e6),
    ("100 nF", "F", 100e-9),
    ("3 uA", "A", 3e-6),
    (f"3 {MICRO_SIGN}A", "A", 3e-6),
    (f"3 {GREEK_MU}A", "A", 3e-6),
    ("1 %", "%", 1.0),
    ("120 K/W", "K/W", 120.0),
    ("-20 °C", "°C", -20.0),
    ("25 degC", "°C", 25.0),
    ("10 A2s", "A²s", 10.0),
    ("10 A²s", "A²s", 10.0),
    ("10A2s", "A²s", 10.0),      # no space: a number and a unit, not an RKM code
    ("3400 mAh", "Ah", 3.4),
    ("40 ms", "s", 40e-3),
    ("300 us", "s", 300e-6),
    ("2 mm", "m", 2e-3),
    ("4.2V", "V", 4.2),
    ("4.2 kV", "V", 4.2e3),
    ("+5 V", "V", 5.0),
    (".5 V", "V", 0.5),
    ("1.5e-3 V", "V", 1.5e-3),
    ("  4.2 V  ", "V", 4.2),
    ("0 Ω", "Ω", 0.0),
    ("500 nH", "H", 500e-9),
]


@pytest.mark.parametrize("text,unit,si", ACCEPTED)
def test_accepted_forms(text, unit, si):
    # SI Brochure table 7 [published] for the prefix factors.
    assert parse_quantity(text, unit) == pytest.approx(si, rel=1e-12)


def test_micro_sign_and_greek_mu_are_the_same_prefix():
    assert parse_quantity(f"3 {MICRO_SIGN}A", "A") == parse_quantity(f"3 {GREEK_MU}A", "A") \
        == parse_quantity("3 uA", "A")


def test_ohm_sign_and_greek_omega_are_the_same_unit():
    a = parse_quantity(f"22 m{OHM_SIGN}", "Ω")
    b = parse_quantity(f"22 m{GREEK_OMEGA}", "Ω")
    assert a == b == pytest.approx(0.022)
    assert parse_quantity(f"470 {OHM_SIGN}", "Ω") == parse_quantity("470 ohm", "Ω") == 470.0


@pytest.mark.parametrize("value,unit", [(1, "%"), (0.5, "%"), (-20, "°C"), (150, "°C"),
                                        (83, "K/W"), (12, "months")])
def test_bare_numbers_are_accepted_where_the_unit_takes_no_prefix(value, unit):
    assert parse_quantity(value, unit) == float(value)
    assert parse_quantity(str(value), unit) == float(value)


# --- refused, with the exact message ------------------------------------------------------------

REFUSED = [
    # RKM codes (IEC 60062 [published]): the hint is the value the code stands for
    ("4k7", "Ω", "'4k7' looks like an RKM code; write '4.7 kΩ'"),
    ("4R7", "Ω", "'4R7' looks like an RKM code; write '4.7 Ω'"),
    ("5V5", "V", "'5V5' looks like an RKM code; write '5.5 V'"),
    ("4n7", "F", "'4n7' looks like an RKM code; write '4.7 nF'"),
    ("5V5", "A", "'5V5' looks like an RKM code; write the value with a decimal point and unit, "
                 "e.g. '1.2 A'"),
    # decimal commas
    ("1,5 V", "V", "'1,5 V' uses a decimal comma; write a decimal point (e.g. '1.5 V')"),
    ("0,8 A", "A", "'0,8 A' uses a decimal comma; write a decimal point (e.g. '0.8 A')"),
    # SPICE's meg
    ("1 meg", "Ω", "'1 meg': 'meg' is SPICE's mega but reads as milli elsewhere; write 'M' for "
                   "mega or 'm' for milli"),
    ("1 megohm", "Ω", "'1 megohm': 'meg' is SPICE's mega but reads as milli elsewhere; write 'M' "
                      "for mega or 'm' for milli"),
    # not finite
    ("NaN", "V", "'NaN' is not a finite number; expected volts (V)"),
    ("nan V", "V", "'nan V' is not a finite number; expected volts (V)"),
    ("inf", "A", "'inf' is not a finite number; expected amperes (A)"),
    ("-inf V", "V", "'-inf V' is not a finite number; expected volts (V)"),
    ("Infinity Ω", "Ω", "'Infinity Ω' is not a finite number; expected ohms (Ω)"),
    ("1e999 V", "V", "'1e999 V' is too large to be a finite number; expected volts (V)"),
    ("1e400", "%", "'1e400' is too large to be a finite number; expected percent (%)"),
    # wrong unit: the message names the expected one
    ("4.2 A", "V", "'4.2 A' is in amperes; expected volts (V)"),
    ("1 Ω", "V", "'1 Ω' is in ohms; expected volts (V)"),
    ("25 K", "°C", "'25 K' is in kelvin (temperature difference); expected degrees Celsius (°C)"),
    ("1 x", "V", "'1 x': unknown unit 'x'; expected volts (V)"),
    ("4.2 v", "V", "'4.2 v': unknown unit 'v'; expected volts (V) (units are case-sensitive: "
                   "write 'V')"),
    ("22 MOHM", "Ω", "'22 MOHM': unknown unit 'MOHM'; expected ohms (Ω) (units are "
                     "case-sensitive: write 'Mohm')"),
    ("1 M", "Ω", "'1 M': 'M' is a prefix without a unit; write '1 MΩ'"),
    ("1 k%", "%", "'1 k%': % takes no SI prefix"),
    # missing unit
    ("4.2", "V", "missing unit: write '4.2 V' (volts)"),
    (4.2, "V", "missing unit: write '4.2 V' (volts)"),
    (470, "Ω", "missing unit: write '470 Ω' (ohms)"),
    # not a number with a unit
    ("V", "V", "'V' is not a number with a unit; expected volts (V), e.g. '4.25 V'"),
    ("lots", "A", "'lots' is not a number with a unit; expected amperes (A), e.g. '1.2 A'"),
    ("yes", "A", "'yes' is not a number with a unit; expected amperes (A), e.g. '1.2 A'"),
    ("0x10 V", "V", "'0x10 V' is not a number with a unit; expected volts (V), e.g. '4.25 V'"),
    ("1_000 V", "V", "'1_000 V' is not a number with a unit; expected volts (V), e.g. '4.25 V'"),
    ("4.2 V V", "V", "'4.2 V V' is not a number with a unit; expected volts (V), e.g. '4.25 V'"),
    ("4.2  V", "V", "'4.2  V': put a single space between the number and the unit, "
                    "e.g. '4.25 V'"),
    # empty
    ("", "V", "empty value; expected volts (V)"),
    ("   ", "A", "empty value; expected amperes (A)"),
    (None, "A", "no value given; expected amperes (A), e.g. '1.2 A'"),
    # out of physics
    ("-1 Ω", "Ω", "-1 Ω is out of physics: ohms must be at least 0 Ω"),
    ("-470 mΩ", "Ω", "-470 mΩ is out of physics: ohms must be at least 0 Ω"),
    ("-100 nF", "F", "-100 nF is out of physics: farads must be at least 0 F"),
    ("0 mAh", "Ah", "0 Ah is out of physics: ampere-hours must be above 0 Ah"),
    ("-3400 mAh", "Ah", "-3.4 Ah is out of physics: ampere-hours must be above 0 Ah"),
    ("0 K/W", "K/W", "0 K/W is out of physics: kelvin per watt must be above 0 K/W"),
    ("-95 A2s", "A²s", "-95 A²s is out of physics: ampere-squared seconds must be at least 0 A²s"),
    # SI Brochure 2.3.1 [published]: nothing is colder than -273.15 °C
    ("-300 °C", "°C", "-300 °C is below absolute zero (-273.15 °C)"),
    ("-273.16 °C", "°C", "-273.16 °C is below absolute zero (-273.15 °C)"),
    (-400, "°C", "-400 °C is below absolute zero (-273.15 °C)"),
    # booleans, lists, mappings
    (True, "V", "expected volts (V), e.g. '4.25 V'; got the boolean true"),
    (False, "%", "expected percent (%), e.g. '1 %'; got the boolean false"),
    (True, "%", "expected percent (%), e.g. '1 %'; got the boolean true"),
    (["1.2 A", "2 A"], "A", "expected amperes (A) as text like '1.2 A', got a list"),
    ({"typ": "1 A"}, "A", "expected amperes (A) as text like '1.2 A', got a mapping"),
    # floats that are not finite, as a YAML loader other than packwarden's could hand them over
    (float("nan"), "%", "nan is not a finite number; expected percent (%)"),
    (float("inf"), "°C", "inf is not a finite number; expected degrees Celsius (°C)"),
    (10 ** 400, "%", "100000000000…(401 digits) is too large; expected percent (%)"),
]


@pytest.mark.parametrize("text,unit,message", REFUSED)
def test_refused_forms_with_their_exact_message(text, unit, message):
    with pytest.raises(QuantityError) as caught:
        parse_quantity(text, unit)
    assert str(caught.value) == message


def test_absolute_zero_itself_is_accepted():
    # SI Brochure 2.3.1 [published]: 0 K = -273.15 °C is the bound, and it is inclusive.
    assert parse_quantity("-273.15 °C", "°C") == -273.15


@pytest.mark.parametrize("unit", sorted(UNITS))
def test_every_unit_accepts_its_own_example(unit):
    # The example a message suggests must itself be accepted, or the advice is a trap.
    from packwarden.quantities import example
    value = parse_quantity(example(UNITS[unit]), unit)
    assert math.isfinite(value)


@given(st.text(alphabet=st.characters(codec="utf-8"), max_size=30))
@settings(max_examples=400, deadline=None)
def test_any_text_gives_a_finite_value_or_a_quantity_error(text):
    for unit in ("V", "Ω", "°C", "%", "Ah"):
        try:
            value = parse_quantity(text, unit)
        except QuantityError as exc:
            assert "\n" not in str(exc)
        else:
            assert math.isfinite(value)


# --- format_quantity ----------------------------------------------------------------------------

FORMATTED = [
    (0.022, "Ω", 3, "22 mΩ"),
    (4.25, "V", 3, "4.25 V"),
    (3e-6, "A", 3, f"3 {MICRO_SIGN}A"),
    (1e-7, "F", 3, "100 nF"),
    (2000.0, "Ω", 3, "2 kΩ"),
    (1e10, "Ω", 3, "10 GΩ"),
    (-0.005, "A", 3, "-5 mA"),
    (0.0, "V", 3, "0 V"),
    (-20.0, "°C", 3, "-20 °C"),      # no prefixes on °C
    (12.5, "%", 3, "12.5 %"),
    (120.0, "K/W", 3, "120 K/W"),
    (4.2567, "V", 3, "4.26 V"),
    (4.2567, "V", 5, "4.2567 V"),
    # rounding that carries into the next prefix takes that prefix
    (999.96e-6, "V", 3, "1 mV"),
    (0.0009995, "V", 3, "999 µV".replace("µ", MICRO_SIGN)),
    (999.9, "V", 3, "1 kV"),
    (float("nan"), "V", 3, "nan V"),
    (float("inf"), "A", 3, "inf A"),
]


@pytest.mark.parametrize("value,unit,digits,text", FORMATTED)
def test_format_quantity(value, unit, digits, text):
    assert format_quantity(value, unit, digits=digits) == text


@given(st.floats(min_value=1e-12, max_value=1e11, allow_nan=False),
       st.sampled_from(["V", "A", "Ω", "F", "s", "W"]), st.booleans())
@settings(max_examples=300, deadline=None)
def test_formatted_values_parse_back(value, unit, negative):
    if negative and UNITS[unit].minimum is None:
        value = -value
    text = format_quantity(value, unit, digits=6)
    assert parse_quantity(text, unit) == pytest.approx(value, rel=1e-5)
