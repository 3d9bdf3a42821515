"""Entry points read from the cache load as ``importlib.metadata.EntryPoint`` loads them.

The reference is ``importlib.metadata.EntryPoint`` itself (the standard library's reader of the
packaging "entry points" specification [published]): for every value, a kept entry point's
``module``, ``attr`` and ``load()`` (its result, or the type and text of its error) must be the
standard library's; a value beyond plain ``module:attr`` is the standard library's own object.
"""

from __future__ import annotations

from importlib.metadata import EntryPoint

import pytest

from packwarden.entrycache import KeptEntryPoint, entry_point

VALUES = [
    "packwarden_rules.unknown_part:check",
    "packwarden.report.text:render",
    "packwarden.report",                       # a module alone
    "os.path:join",
    "collections:OrderedDict.fromkeys",       # an attribute of an attribute
    "collections:OrderedDict.nothing_here",   # AttributeError
    "no_such_module_for_packwarden:check",     # ModuleNotFoundError
    "packwarden..report:render",               # an empty part of a module name
    "os:path.",                                # a trailing dot
    "os: path",                                # whitespace: the standard library's object
    "os:path [extra]",                         # extras: likewise
    "os:",                                     # nothing after the colon: likewise
    "bad value!",                              # matches no pattern: likewise
    "modulé:x",                                # not ASCII: likewise
]


def outcome(ep) -> tuple:
    try:
        return ("ok", ep.load())
    except BaseException as exc:  # noqa: BLE001 - compared, type and text
        return ("error", type(exc).__name__, str(exc))


@pytest.mark.parametrize("value", VALUES)
def test_loads_as_the_standard_library_does(value: str) -> None:
    ours = entry_point("some-rule", value, "packwarden.rules")
    reference = EntryPoint("some-rule", value, "packwarden.rules")
    assert (ours.name, ours.value, ours.group) == (reference.name, reference.value,
                                                   reference.group)
    assert outcome(ours) == outcome(reference)
    if reference.pattern.match(value):
        assert (ours.module, ours.attr) == (reference.module, reference.attr)


@pytest.mark.parametrize("value", VALUES)
def test_only_a_plain_value_is_kept(value: str) -> None:
    plain = EntryPoint.pattern.fullmatch(value) is not None and value.isascii() \
        and " " not in value and "[" not in value and not value.endswith(":")
    assert isinstance(entry_point("r", value, "g"), KeptEntryPoint) == plain
