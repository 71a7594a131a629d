"""The report's per-joint drawings sent once, as templates and numbers, and drawn on demand.

A joint's drawings (section, joint diagram, fatigue diagram, stack-up chart) are SVG written
by :mod:`geomjoint.report.plots` from one fixed layout, so the elements of every joint's
drawings repeat the same tags and styles with other numbers and labels.  The page keeps
each distinct element once, as a template with its numbers, ids and texts taken out, and
each drawing as the list of its elements (a template number and the values that go in);
the page's script puts the SVG text back together, exactly as written, when a joint's
section is opened (or all of them, or the page is printed).  The closed page then holds no
SVG at all, which is what makes a report of hundreds of joints small and quick to open.

:func:`compact` takes an HTML fragment and gives it back with each ``<svg>`` replaced by an
empty slot ``<span class="drawing" data-drawing="n"></span>``; :func:`payload` is the
``<script type="application/json">`` element that holds the templates and drawings;
:func:`expand` rebuilds a page's drawings in Python (the same rule as the page's script:
tests and tools read the page through it).
"""
from __future__ import annotations

import json
import re
from dataclasses import dataclass, field

#: id of the script element that holds the drawings
PAYLOAD_ID = "drawings"
#: where a value goes in a template (a character SVG text never holds)
HOLE = "\x01"
#: attributes whose values differ from element to element (positions, sizes, ids, labels);
#: the others (colours, line widths, fonts) stay in the template
VARYING = frozenset({"x", "y", "width", "height", "cx", "cy", "r", "points", "d", "transform", "id",
                     "clip-path", "aria-label", "viewBox"})
#: a value written as a JSON number: one that String(number) (and Python's repr) gives back
#: unchanged: no exponent, at most 3 decimals and no trailing zero, no "-0", at most 15 digits
_PLAIN_NUMBER = re.compile(r"-?(?:0|[1-9]\d{0,11})(?:\.\d{0,2}[1-9])?")
#: an element with its text (one token), another tag, or text between tags
_TOKEN = re.compile(r"<text\b[^>]*>[^<]*</text>|<[^>]*>|[^<]+")
_ATTRIBUTE = re.compile(r'([\w:-]+)="([^"]*)"')
_SVG = re.compile(r"<svg\b.*?</svg>", re.S)
_SLOT = re.compile(r'<span class="drawing" data-drawing="(\d+)"></span>')
_PAYLOAD = re.compile(rf'<script type="application/json" id="{PAYLOAD_ID}">(.*?)</script>', re.S)


def _value(text: str):
    if _PLAIN_NUMBER.fullmatch(text) and text != "-0":
        return float(text) if "." in text else int(text)
    return text


@dataclass
class Drawings:
    """The templates met so far and the drawings as lists of (template, values...)."""

    templates: list[str] = field(default_factory=list)
    drawings: list[list] = field(default_factory=list)
    _index: dict[str, int] = field(default_factory=dict)
    _items: dict[str, object] = field(default_factory=dict)   # tokens met before (many repeat)

    def _template(self, text: str) -> int:
        k = self._index.get(text)
        if k is None:
            k = self._index[text] = len(self.templates)
            self.templates.append(text)
        return k

    def add(self, svg: str) -> int:
        """Number of the drawing ``svg`` (kept as templates and values)."""
        items: list = []
        for token in _TOKEN.findall(svg):
            item = self._items.get(token)
            if item is None:
                item = self._items[token] = self._item(token)
            items.append(item)
        self.drawings.append(items)
        return len(self.drawings) - 1

    def _item(self, token: str):
        """A token as (template, values...), or the template's number when nothing varies."""
        values: list = []
        if token.startswith("<"):
            def hole(m: re.Match) -> str:
                name, value = m.group(1), m.group(2)
                if name in VARYING or value.startswith("url("):
                    values.append(_value(value))
                    return f'{name}="{HOLE}"'
                return m.group(0)

            head, sep, rest = token.partition(">")
            template = _ATTRIBUTE.sub(hole, head) + sep
            if rest:                          # <text ...>words</text>: the words vary too
                words, _, tail = rest.partition("<")
                values.append(words)
                template += HOLE + "<" + tail
        else:
            template = HOLE
            values.append(token)
        k = self._template(template)
        return [k, *values] if values else k


def compact(fragment: str, drawings: Drawings) -> str:
    """``fragment`` with each SVG drawing replaced by its slot (the drawing joins ``drawings``)."""
    return _SVG.sub(lambda m: f'<span class="drawing" data-drawing="{drawings.add(m.group(0))}"></span>',
                    fragment)


def payload(drawings: Drawings) -> str:
    """The script element holding the templates and drawings (JSON; "<" written as \\u003c so
    that no text of a drawing can close the element)."""
    data = json.dumps({"templates": drawings.templates, "drawings": drawings.drawings},
                      ensure_ascii=False, separators=(",", ":")).replace("<", "\\u003c")
    return f'<script type="application/json" id="{PAYLOAD_ID}">{data}</script>'


def _text(value) -> str:
    # JavaScript's String(number) for the plain numbers _value makes
    if isinstance(value, float):
        text = repr(value)
        return text[:-2] if text.endswith(".0") else text
    return str(value)


def drawing(templates: list[str], items: list) -> str:
    """The SVG text of one drawing (what the page's script builds)."""
    out = []
    for item in items:
        if isinstance(item, int):
            out.append(templates[item])
            continue
        parts = templates[item[0]].split(HOLE)
        out.append(parts[0])
        for value, part in zip(item[1:], parts[1:]):
            out.append(_text(value) + part)
    return "".join(out)


def expand(page: str) -> str:
    """The page with every drawing back in its slot (and no payload): the page as it would be
    with its drawings inline, for tools and tests that read the SVG."""
    m = _PAYLOAD.search(page)
    if m is None:
        return page
    data = json.loads(m.group(1))
    templates, items = data["templates"], data["drawings"]
    page = page[:m.start()] + page[m.end():]
    return _SLOT.sub(lambda s: drawing(templates, items[int(s.group(1))]), page)


#: the page's script that draws a section's drawings (see :mod:`geomjoint.report.html`)
SCRIPT = """
var drawingData = null;
function drawingData_() {
  if (drawingData === null) {
    var element = document.getElementById("%s");
    drawingData = element ? JSON.parse(element.textContent) : {templates: [], drawings: []};
  }
  return drawingData;
}
function drawingText(n) {
  var data = drawingData_(), out = "";
  data.drawings[n].forEach(function (item) {
    if (typeof item === "number") { out += data.templates[item]; return; }
    var parts = data.templates[item[0]].split("\\u0001");
    out += parts[0];
    for (var i = 1; i < parts.length; i++) { out += String(item[i]) + parts[i]; }
  });
  return out;
}
function draw(root) {
  root.querySelectorAll("span.drawing[data-drawing]").forEach(function (slot) {
    slot.outerHTML = drawingText(+slot.getAttribute("data-drawing"));
  });
}
window.geomjointDrawing = drawingText;
""" % PAYLOAD_ID
