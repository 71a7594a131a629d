"""The verdict colours of every output (marked-up STEP, GLB, HTML), in one place.

Blue / amber / vermilion stay apart for the common colour-vision deficiencies (none of
them is a red–green pair) and they also differ in lightness (CIE L* about 27 / 76 / 49),
so a grey-scale print or a viewer that renders in grey still tells them apart.  The
values are the ones the HTML report already uses.
"""
from __future__ import annotations

#: fill colour of each verdict, sRGB hex
VERDICT_COLOURS: dict[str, str] = {
    "pass": "#163e7a",      # dark blue
    "marginal": "#f2b134",  # light amber
    "fail": "#c4441c",      # dark vermilion
}
#: text colour on top of each verdict colour (contrast)
VERDICT_TEXT: dict[str, str] = {"pass": "#ffffff", "marginal": "#1a1a1a", "fail": "#ffffff"}
#: colour of a joint without a verdict (should not happen; kept visible, neutral grey)
UNKNOWN_COLOUR = "#808080"
#: opacity of pressure-cone volumes in viewers that honour it (0 transparent .. 1 opaque)
CONE_ALPHA = 0.35
#: colour of a part that had none in the model (neutral light grey)
PART_COLOUR = "#b4b8bd"


def hex_to_rgb(code: str) -> tuple[float, float, float]:
    """sRGB hex "#rrggbb" -> (r, g, b) in 0..1.

    >>> hex_to_rgb("#ff8000")
    (1.0, 0.5019607843137255, 0.0)
    """
    text = code.lstrip("#")
    if len(text) != 6:
        raise ValueError(f"not an sRGB hex colour: {code!r}")
    return tuple(int(text[i:i + 2], 16) / 255.0 for i in (0, 2, 4))  # type: ignore[return-value]


#: the verdict colours as sRGB 0..1 triples
VERDICT_RGB: dict[str, tuple[float, float, float]] = {k: hex_to_rgb(v) for k, v in VERDICT_COLOURS.items()}


def verdict_rgb(verdict: str | None) -> tuple[float, float, float]:
    """sRGB 0..1 of a verdict ("pass" | "marginal" | "fail"); grey for anything else."""
    return VERDICT_RGB.get(verdict or "", hex_to_rgb(UNKNOWN_COLOUR))
