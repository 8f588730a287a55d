"""The conventions of the command line, in one place (``tests/cli/test_conventions.py`` holds
every command to them).

Placeholders (metavars)
    A placeholder names what goes there, as an upper-case noun from :data:`PLACEHOLDERS`:
    ``REG``, ``FILE``, ``MASS``, ``LENGTH``. Compound values join placeholders with the
    characters the value itself uses (``SEAT=MASS``, ``LABEL=MASS@ARM[,LAT[,VERT]]``); square
    brackets mark an optional part and ``…`` a repeated one. Lower-case words are literal
    choices, typed as shown and joined by ``|`` (``csv|json``, ``proportional|TANK,…``).
    A placeholder names a unit only where the value is a bare number in that unit (``FT``).
    Optional and repeated arguments are shown by the help itself (``[REG]``, ``FILE...``): the
    placeholder never carries its own brackets. Flags take no placeholder.

Option names
    One concept, one name, everywhere: :data:`SYNONYMS` lists the names refused in favour of the
    one in use (``--configuration``, never ``--config``).

Help
    Every command, option and argument has help text; a required option is declared required,
    so that the help marks it. The main commands end their help with examples
    (:func:`examples`).
"""

from __future__ import annotations

__all__ = ["PLACEHOLDERS", "SYNONYMS", "examples"]

#: The placeholder words, one per concept (QTY, never QUANTITY; REG, never REGISTRATION).
PLACEHOLDERS = frozenset({
    # things in the ledger
    "REG", "ITEM", "NAME", "ID", "SEQ", "HASH", "PLAN",
    # quantities typed with a unit ("520 lb", "47.5 in"), or bare numbers in a named unit
    "MASS", "LENGTH", "QTY", "ANGLE", "SIZE", "DENSITY", "TEMP", "FT", "N",
    # parts of compound values
    "SEAT", "CLASS", "STATION", "TANK", "POINT", "LABEL", "ARM", "LAT", "VERT", "KIND", "KEY",
    "VALUE", "PHASE", "SET",
    # text, dates, files, places
    "TEXT", "YYYY-MM-DD", "FILE", "KEYFILE", "FOLDER", "URL", "PAPER",
})

#: Option names refused, each in favour of the name the commands use for that concept.
SYNONYMS = {
    "--configuration": ("--config", "--conf", "--cfg"),
    "--date": ("--on", "--when", "--work-date", "--entry-date"),
    "--as-of": ("--asof", "--at", "--until"),
    "--ref": ("--reference", "--work-order", "--wo"),
    "--by": ("--user", "--actor", "--who", "--signatory"),
    "--reason": ("--why", "--because"),
    "--note": ("--notes", "--comment", "--remark", "--remarks"),
    "--plan": ("--plan-file", "--loading-plan"),
    "--type": ("--type-name", "--vehicle-type", "--model"),
    "--vehicle": ("--registration", "--reg", "--tail"),
    "--json": ("--as-json", "--json-output"),
    "--max-size": ("--size-limit", "--max-bytes"),
    "--dry-run": ("--dryrun", "--preview", "--simulate"),
    "--mass": ("--weight",),
    "--output": ("--out-file", "--outfile"),
}


def examples(*lines: str) -> str:
    """The ``Examples`` epilog of a command's help: command lines as typed, one per line.

    A line longer than fits an 80-column help continues on the next with a backslash, so that
    the help never wraps an example and every one can be pasted into a shell.

    Examples
    --------
    >>> examples("wbledger vehicle list", "wbledger vehicle list --json").splitlines()
    ['Examples:', 'wbledger vehicle list', 'wbledger vehicle list --json']
    """
    return "Examples:\n" + "\n".join(lines)
