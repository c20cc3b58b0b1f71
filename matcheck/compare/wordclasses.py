"""Classes of words the word-level comparison tells apart: facts, and cosmetic variants.

Everything here works on one word of a passage (a :class:`~matcheck.language.words.Word`'s
text) and is a small documented table or rule (docs/comparison.md, "Changes inside a
passage"):

- :func:`normalise` folds what never changes meaning: case, curly quotes and apostrophes,
  dash styles (:func:`matcheck.textnorm.fold`, as the readers do), and the British spellings
  of the table :data:`BRITISH` (plus the ``-ise`` → ``-ize`` rule), so two versions that
  differ only there compare equal word for word;
- :func:`number_value` reads a number written in digits or words (``3``, ``3.5``, ``1,200``,
  ``three``, ``half``, ``1/2``, ``½``, ``second``) as one canonical string;
- :data:`UNITS`, :data:`NEGATIONS` and :data:`COMPARATIVES` are the units, negations and
  comparatives or directions whose change is a changed fact.
"""

from __future__ import annotations

import re
import unicodedata
from functools import cache

from matcheck import textnorm

# Cardinals, fractions and ordinals written as words (ordinals: "the second valve" and "the
# third valve" are different facts). "one" is left out: it is as often a pronoun ("which one")
# or an article ("one drop", "a drop"); "one turn" against "two turns" still differs by the two.
_CARDINALS = {
    "zero": 0,
    "two": 2,
    "three": 3,
    "four": 4,
    "five": 5,
    "six": 6,
    "seven": 7,
    "eight": 8,
    "nine": 9,
    "ten": 10,
    "eleven": 11,
    "twelve": 12,
    "thirteen": 13,
    "fourteen": 14,
    "fifteen": 15,
    "sixteen": 16,
    "seventeen": 17,
    "eighteen": 18,
    "nineteen": 19,
    "twenty": 20,
    "thirty": 30,
    "forty": 40,
    "fifty": 50,
    "sixty": 60,
    "seventy": 70,
    "eighty": 80,
    "ninety": 90,
    "hundred": 100,
    "thousand": 1000,
    "million": 1_000_000,
    "billion": 1_000_000_000,
    "dozen": 12,
    "twice": 2,
}
_FRACTIONS = {
    "half": "1/2",
    "halves": "1/2",
    "third": "1/3",
    "thirds": "1/3",
    "quarter": "1/4",
    "quarters": "1/4",
}
_ORDINALS = {
    "first": "1st",
    "second": "2nd",
    "fourth": "4th",
    "fifth": "5th",
    "sixth": "6th",
    "seventh": "7th",
    "eighth": "8th",
    "ninth": "9th",
    "tenth": "10th",
}
_DIGITS = re.compile(r"^[+-]?(?:\d{1,3}(?:,\d{3})+|\d+)(?:\.\d+)?$")
_FRACTION = re.compile(r"^\d+/\d+$")
_ORDINAL = re.compile(r"^(\d+)(?:st|nd|rd|th)$")
# A number glued to its unit or sign: "20°c", "5v", "230v", "50%", "10kg".
_GLUED = re.compile(r"^(\d+(?:[.,]\d+)?)(°?[a-zµ%][a-zµ/%²³]*)$")

# Units of measurement, each spelling mapped to one name. Plurals are found by stripping a
# final "s" (see unit_name). Judgment call: the units a technical lesson commonly states.
UNITS: dict[str, str] = {
    "%": "percent",
    "percent": "percent",
    "per cent": "percent",
    "percentage": "percent",
    "mm": "millimetre",
    "millimetre": "millimetre",
    "millimeter": "millimetre",
    "cm": "centimetre",
    "centimetre": "centimetre",
    "centimeter": "centimetre",
    "m": "metre",
    "metre": "metre",
    "meter": "metre",
    "km": "kilometre",
    "kilometre": "kilometre",
    "kilometer": "kilometre",
    "inch": "inch",
    "inche": "inch",
    "foot": "foot",
    "feet": "foot",
    "ft": "foot",
    "yard": "yard",
    "mile": "mile",
    "mg": "milligram",
    "milligram": "milligram",
    "g": "gram",
    "gram": "gram",
    "kg": "kilogram",
    "kilogram": "kilogram",
    "kilo": "kilogram",
    "tonne": "tonne",
    "ton": "tonne",
    "ounce": "ounce",
    "oz": "ounce",
    "pound": "pound",
    "lb": "pound",
    "ml": "millilitre",
    "millilitre": "millilitre",
    "milliliter": "millilitre",
    "l": "litre",
    "litre": "litre",
    "liter": "litre",
    "cup": "cup",
    "teaspoon": "teaspoon",
    "tablespoon": "tablespoon",
    "gallon": "gallon",
    "pint": "pint",
    "ms": "millisecond",
    "millisecond": "millisecond",
    "sec": "second",
    "seconds": "second",
    "min": "minute",
    "minute": "minute",
    "h": "hour",
    "hr": "hour",
    "hour": "hour",
    "day": "day",
    "week": "week",
    "month": "month",
    "year": "year",
    "°c": "degree celsius",
    "celsius": "degree celsius",
    "centigrade": "degree celsius",
    "°f": "degree fahrenheit",
    "fahrenheit": "degree fahrenheit",
    "kelvin": "kelvin",
    "degree": "degree",
    "°": "degree",
    "w": "watt",
    "watt": "watt",
    "kw": "kilowatt",
    "kilowatt": "kilowatt",
    "kwh": "kilowatt hour",
    "v": "volt",
    "volt": "volt",
    "a": "ampere",
    "amp": "ampere",
    "ampere": "ampere",
    "mah": "milliampere hour",
    "ohm": "ohm",
    "hz": "hertz",
    "hertz": "hertz",
    "khz": "kilohertz",
    "mhz": "megahertz",
    "ghz": "gigahertz",
    "pa": "pascal",
    "kpa": "kilopascal",
    "bar": "bar",
    "psi": "psi",
    "nm": "newton metre",
    "newton": "newton",
    "rpm": "revolution per minute",
    "mph": "mile per hour",
    "kph": "kilometre per hour",
    "km/h": "kilometre per hour",
    "bit": "bit",
    "byte": "byte",
    "kb": "kilobyte",
    "mb": "megabyte",
    "gb": "gigabyte",
    "tb": "terabyte",
    "mbps": "megabit per second",
    "gbps": "gigabit per second",
    "calorie": "calorie",
    "kcal": "kilocalorie",
    "joule": "joule",
    "lumen": "lumen",
    "decibel": "decibel",
    "db": "decibel",
}
# Single letters are units only right after a number ("5 m", "230 V"); alone they are words
# ("a", "m" in "I'm"), see is_unit.
_LETTER_UNITS = frozenset(unit for unit in UNITS if len(unit) == 1 and unit.isalpha())

NEGATIONS = frozenset(
    {
        "not",
        "no",
        "never",
        "without",
        "none",
        "nor",
        "neither",
        "nothing",
        "nobody",
        "nowhere",
        "cannot",
    }
)

# Comparatives, superlatives and directions, in base form (inflections are found by
# base_form). Judgment call: the words that turn a statement into its opposite or shift it.
COMPARATIVES = frozenset(
    {
        "higher",
        "lower",
        "highest",
        "lowest",
        "more",
        "less",
        "most",
        "least",
        "fewer",
        "fewest",
        "greater",
        "smaller",
        "larger",
        "bigger",
        "longer",
        "shorter",
        "faster",
        "slower",
        "hotter",
        "colder",
        "warmer",
        "cooler",
        "stronger",
        "weaker",
        "heavier",
        "lighter",
        "thicker",
        "thinner",
        "tighter",
        "looser",
        "earlier",
        "later",
        "better",
        "worse",
        "best",
        "worst",
        "before",
        "after",
        "above",
        "below",
        "increase",
        "decrease",
        "rise",
        "fall",
        "reduce",
        "maximum",
        "minimum",
        "clockwise",
        "anticlockwise",
        "counterclockwise",
        "positive",
        "negative",
    }
)
_INFLECTIONS = ("ing", "ed", "es", "s", "d")

# British spellings and their American counterparts, for the common pairs of a technical or
# everyday lesson (judgment call; the rule "-ise" -> "-ize" in american() covers the rest of
# that family). Both versions are folded to the American spelling before they are compared.
BRITISH: dict[str, str] = {
    "colour": "color",
    "colours": "colors",
    "coloured": "colored",
    "behaviour": "behavior",
    "behaviours": "behaviors",
    "favour": "favor",
    "favourite": "favorite",
    "flavour": "flavor",
    "harbour": "harbor",
    "honour": "honor",
    "humour": "humor",
    "labour": "labor",
    "neighbour": "neighbor",
    "neighbours": "neighbors",
    "odour": "odor",
    "rumour": "rumor",
    "vapour": "vapor",
    "centre": "center",
    "centres": "centers",
    "centred": "centered",
    "fibre": "fiber",
    "fibres": "fibers",
    "litre": "liter",
    "litres": "liters",
    "metre": "meter",
    "metres": "meters",
    "millimetre": "millimeter",
    "millimetres": "millimeters",
    "centimetre": "centimeter",
    "centimetres": "centimeters",
    "kilometre": "kilometer",
    "kilometres": "kilometers",
    "theatre": "theater",
    "analyse": "analyze",
    "analysed": "analyzed",
    "analyses": "analyzes",
    "analysing": "analyzing",
    "paralyse": "paralyze",
    "catalyse": "catalyze",
    "travelled": "traveled",
    "travelling": "traveling",
    "traveller": "traveler",
    "labelled": "labeled",
    "labelling": "labeling",
    "modelled": "modeled",
    "modelling": "modeling",
    "cancelled": "canceled",
    "cancelling": "canceling",
    "fuelled": "fueled",
    "fuelling": "fueling",
    "signalled": "signaled",
    "signalling": "signaling",
    "levelled": "leveled",
    "levelling": "leveling",
    "tyre": "tire",
    "tyres": "tires",
    "aluminium": "aluminum",
    "grey": "gray",
    "programme": "program",
    "programmes": "programs",
    "mould": "mold",
    "mouldy": "moldy",
    "plough": "plow",
    "sulphur": "sulfur",
    "catalogue": "catalog",
    "dialogue": "dialog",
    "defence": "defense",
    "licence": "license",
    "offence": "offense",
    "practise": "practice",
    "practised": "practiced",
    "cheque": "check",
    "kerb": "curb",
    "aeroplane": "airplane",
    "draught": "draft",
    "enrol": "enroll",
    "fulfil": "fulfill",
    "jewellery": "jewelry",
    "manoeuvre": "maneuver",
    "oestrogen": "estrogen",
    "pyjamas": "pajamas",
    "storey": "story",
    "whilst": "while",
    "amongst": "among",
    "towards": "toward",
}
# "-ise" words that have a different "-ize" word beside them: never folded.
_ISE_KEPT = frozenset({"prise", "prised", "prises", "prising"})
_ISE = re.compile(r"^(.{3,})is(e|es|ed|ing|ation|ations|er|ers)$")
_CONTRACTIONS = {"can't": ("can", "not"), "won't": ("will", "not"), "cannot": ("can", "not")}


def fold(text: str) -> str:
    """Case, quote and dash styles folded: the spelling a comparison should see. Lesson text
    is already folded by the readers (:func:`matcheck.textnorm.fold`); NFKC writes "½" as
    "1⁄2", whose fraction slash is read as "/"."""
    return textnorm.fold(text).replace("\u2044", "/").lower()


def american(word: str) -> str:
    """The American spelling of a folded British one (unchanged when not British)."""
    found = BRITISH.get(word)
    if found is not None:
        return found
    if word not in _ISE_KEPT and (match := _ISE.match(word)):
        return f"{match.group(1)}iz{match.group(2)}"
    return word


@cache
def normalise(text: str) -> tuple[str, ...]:
    """The folded form of one word, with negative contractions split ("doesn't" -> "does",
    "not"), so "does not" and "doesn't" compare equal."""
    word = american(fold(text))
    if word in _CONTRACTIONS:
        return _CONTRACTIONS[word]
    if word.endswith("n't") and len(word) > 3:
        return (word[:-3], "not")
    return (word,)


def number_value(word: str) -> str | None:
    """A canonical string for a number written in digits or words; None for other words."""
    if word in _CARDINALS:
        return str(_CARDINALS[word])
    if word in _FRACTIONS:
        return _FRACTIONS[word]
    if word in _ORDINALS:
        return _ORDINALS[word]
    if _DIGITS.match(word):
        text = word.replace(",", "").lstrip("+")
        return text.rstrip("0").rstrip(".") if "." in text else text
    if _FRACTION.match(word):
        return word
    if match := _ORDINAL.match(word):
        return f"{match.group(1)}th"
    if len(word) == 1 and unicodedata.category(word) == "No":
        try:
            return f"{unicodedata.numeric(word):g}"
        except (TypeError, ValueError):
            return None
    return None


def split_glued(word: str) -> tuple[str, str] | None:
    """``("20", "°c")`` for a number glued to its unit ("20°c", "230v", "50%")."""
    match = _GLUED.match(word)
    if match and unit_name(match.group(2)) is not None:
        return match.group(1), match.group(2)
    return None


def unit_name(word: str, *, after_number: bool = True) -> str | None:
    """The unit a word names (plurals and abbreviations folded), or None."""
    if word in _LETTER_UNITS and not after_number:
        return None
    if word in UNITS:
        return UNITS[word]
    if word.endswith("s") and word[:-1] in UNITS and len(word) > 2:
        return UNITS[word[:-1]]
    return None


# Units that measure the same thing, in one base unit each: a quantity restated in another of
# them ("twenty minutes", "a third of an hour") is the same fact.
SCALES: dict[str, tuple[str, float]] = {
    "millisecond": ("time", 0.001),
    "second": ("time", 1.0),
    "minute": ("time", 60.0),
    "hour": ("time", 3600.0),
    "day": ("time", 86400.0),
    "week": ("time", 604800.0),
    "millimetre": ("length", 0.001),
    "centimetre": ("length", 0.01),
    "metre": ("length", 1.0),
    "kilometre": ("length", 1000.0),
    "milligram": ("mass", 0.001),
    "gram": ("mass", 1.0),
    "kilogram": ("mass", 1000.0),
    "millilitre": ("volume", 0.001),
    "litre": ("volume", 1.0),
    "watt": ("power", 1.0),
    "kilowatt": ("power", 1000.0),
}


def number_float(value: str) -> float:
    """The value of a :func:`number_value` string ("1/3" -> 0.333..., "2nd" -> 2)."""
    text = re.sub(r"(st|nd|rd|th)$", "", value)
    if "/" in text:
        top, bottom = text.split("/", 1)
        return float(top) / float(bottom) if float(bottom) else float("nan")
    return float(text)


def quantity(numbers: list[str], units: list[str]) -> tuple[str, float] | None:
    """One quantity in base units (the numbers multiplied, "a third of an hour" -> 1200 s),
    or None when the words are not one number-and-unit statement."""
    if len(units) != 1 or not numbers or units[0] not in SCALES:
        return None
    kind, scale = SCALES[units[0]]
    value = scale
    for number in numbers:
        value *= number_float(number)
    return kind, value


def base_form(word: str) -> str | None:
    """The comparative or direction a word is an inflection of ("increased" -> "increase")."""
    if word in COMPARATIVES:
        return word
    for ending in _INFLECTIONS:
        stem = word[: -len(ending)]
        if word.endswith(ending) and len(stem) > 2:
            if stem in COMPARATIVES:
                return stem
            if stem + "e" in COMPARATIVES:
                return stem + "e"
    if word.endswith("ing") and len(word) > 6 and word[-4] == word[-5]:  # "dropping"
        return word[:-4] if word[:-4] in COMPARATIVES else None
    return None


def is_negation(word: str) -> bool:
    return word in NEGATIONS


def edit_distance(a: str, b: str, limit: int = 2) -> int:
    """Damerau–Levenshtein distance, restricted form (adjacent swaps count one; Damerau 1964,
    docs/references.md §24), or ``limit + 1`` beyond ``limit``."""
    if abs(len(a) - len(b)) > limit:
        return limit + 1
    previous2: list[int] = []
    previous = list(range(len(b) + 1))
    for i in range(1, len(a) + 1):
        current = [i] + [0] * len(b)
        for j in range(1, len(b) + 1):
            cost = 0 if a[i - 1] == b[j - 1] else 1
            current[j] = min(previous[j] + 1, current[j - 1] + 1, previous[j - 1] + cost)
            if i > 1 and j > 1 and a[i - 1] == b[j - 2] and a[i - 2] == b[j - 1]:
                current[j] = min(current[j], previous2[j - 2] + 1)
        previous2, previous = previous, current
    return min(previous[len(b)], limit + 1)
