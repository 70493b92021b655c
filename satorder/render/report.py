"""One self-contained HTML report to share: a small builder that commands fill with sections.

A report opens offline in any browser: no scripts, no fonts or style sheets from elsewhere,
pictures inline as SVG, tables as HTML tables, every user string escaped.  It is written
atomically (:func:`satorder.io.files.atomic_write`).  A page is a few calls::

    Report("satorder solve").header(problem.source, problem.n, answer.status) \\
        .requirements(problem, succ=answer.succ).picture(svg).caution().write("r.html")

Sections: :meth:`Report.header` (problem name, size, status and a few facts),
:meth:`Report.requirements` (the requirements table, each with its state in the answer),
:meth:`Report.section` and :meth:`Report.text`, :meth:`Report.table`, :meth:`Report.picture`,
:meth:`Report.caution` (the caution paragraph of the README).

>>> r = Report("demo").header("a<b>.json", 2, "feasible").table(["x"], [["<1>"]]).caution()
>>> page = r.html()
>>> "a&lt;b&gt;.json" in page and "&lt;1&gt;" in page and "<script" not in page
True
"""

from __future__ import annotations

import re
from html import escape
from itertools import islice

from satorder.io.files import atomic_write
from satorder.model.requirement import FEASIBLE, INFEASIBLE

#: the caution paragraph of the README (section "Caution"), repeated in every report
CAUTION = ("satorder knows only the requirements you give it. An order it computes is "
           "consistent with those requirements and nothing else: before you use a sequence for "
           "physical or safety-relevant work, check it against local codes, site procedures and "
           "qualified people.")
REQUIREMENT_ROWS = 300  # rows of the requirements table before "… and N more"
TABLE_ROWS = 2000  # rows of any other table

STYLE = """
body { font-family: "DejaVu Sans", Verdana, Arial, sans-serif; color: #1a1a1a; margin: 24px;
       max-width: 1200px; line-height: 1.4; }
h1 { font-size: 1.5em; margin-bottom: 0.2em; }
h2 { font-size: 1.15em; margin-top: 1.6em; border-bottom: 1px solid #ccc; }
table { border-collapse: collapse; margin: 0.6em 0; font-size: 0.92em; }
th, td { border: 1px solid #c8ced6; padding: 3px 8px; text-align: left; vertical-align: top; }
th { background: #eef1f5; }
td.num { text-align: right; font-variant-numeric: tabular-nums; }
caption { text-align: left; font-weight: bold; padding: 4px 0; }
.facts td:first-child { font-weight: bold; background: #f6f7f9; }
.status { display: inline-block; padding: 1px 10px; border-radius: 4px; font-weight: bold;
          border: 2px solid; }
.status.feasible { color: #006b4f; border-color: #009E73; }
.status.infeasible { color: #9c3d00; border-color: #D55E00; }
.status.other { color: #444; border-color: #888; }
.picture { overflow-x: auto; margin: 0.8em 0; border: 1px solid #e2e5ea; }
.picture svg { display: block; }
.note { color: #444; font-size: 0.92em; }
.caution { border-left: 4px solid #E69F00; background: #fff8e6; padding: 8px 12px; }
"""


def _cell(value) -> str:
    if value is None:
        return "—"
    if isinstance(value, float):
        return f"{value:.3f}" if abs(value) < 1e6 else f"{value:.3e}"
    return str(value)


def _prefix_ids(svg: str, prefix: str) -> str:
    """Give every ``id`` of an inline SVG (and its ``url(#…)`` uses) a prefix, so two pictures
    on one page never share an id."""
    ids = set(re.findall(r'\bid="([^"]+)"', svg))
    for name in ids:
        svg = svg.replace(f'id="{name}"', f'id="{prefix}{name}"')
        svg = svg.replace(f"url(#{name})", f"url(#{prefix}{name})")
    return svg


class Report:
    """A page being built; every method returns the report, so calls chain."""

    def __init__(self, title: str, command: str | None = None):
        self.title = title
        self.command = command
        self.parts: list[str] = []
        self._pictures = 0

    # ------------------------------------------------------------------ sections
    def header(self, name: str, items: int | str, status: str,
               facts: list[tuple[str, object]] = ()) -> Report:
        """The problem's name, its size, the status (a word in a frame, never colour alone)
        and further ``(label, value)`` facts."""
        kind = str(status) if status in (FEASIBLE, INFEASIBLE) else "other"
        self.parts.append(f"<h1>{escape(self.title)}: {escape(str(name))}</h1>")
        rows = [("problem", escape(str(name))), ("size", escape(str(items))),
                ("status", f'<span class="status {kind}">{escape(str(status))}</span>')]
        rows += [(escape(str(k)), escape(_cell(v))) for k, v in facts]
        body = "".join(f"<tr><td>{k}</td><td>{v}</td></tr>" for k, v in rows)
        self.parts.append(f'<table class="facts">{body}</table>')
        if self.command:
            self.parts.append(f'<p class="note">Made by <code>{escape(self.command)}</code>.</p>')
        return self

    def section(self, heading: str, text: str = "") -> Report:
        self.parts.append(f"<h2>{escape(heading)}</h2>")
        return self.text(text) if text else self

    def text(self, paragraph: str, note: bool = False) -> Report:
        cls = ' class="note"' if note else ""
        self.parts.append(f"<p{cls}>{escape(paragraph)}</p>")
        return self

    def table(self, columns: list[str], rows, caption: str = "", numeric=(),
              limit: int = TABLE_ROWS, more: str = "") -> Report:
        """An HTML table; ``numeric`` names the columns aligned right.  Past ``limit`` rows a
        line says how many are left out (and ``more``: where to find them)."""
        numeric = set(numeric)
        rows = list(rows)
        head = "".join(f"<th>{escape(c)}</th>" for c in columns)
        body = []
        for row in rows[:limit]:
            cells = []
            for c, v in zip(columns, row):
                cls = ' class="num"' if c in numeric else ""
                cells.append(f"<td{cls}>{escape(_cell(v))}</td>")
            body.append("<tr>" + "".join(cells) + "</tr>")
        cap = f"<caption>{escape(caption)}</caption>" if caption else ""
        self.parts.append(f"<table>{cap}<thead><tr>{head}</tr></thead><tbody>"
                          + "".join(body) + "</tbody></table>")
        if len(rows) > limit:
            self.text(f"… and {len(rows) - limit} more rows not shown{more}.", note=True)
        return self

    def picture(self, svg: str) -> Report:
        """An SVG picture, inline (its title, caption and legend are part of the picture)."""
        self._pictures += 1
        body = svg[svg.index("<svg"):]  # no XML declaration inside HTML
        self.parts.append(f'<div class="picture">{_prefix_ids(body, f"p{self._pictures}-")}</div>')
        return self

    def caution(self) -> Report:
        self.parts.append(f'<h2>Caution</h2><p class="caution">{escape(CAUTION)}</p>')
        return self

    def requirements(self, problem, succ=None, core=None, unmet=None,
                     limit: int = REQUIREMENT_ROWS) -> Report:
        """The requirements table: a count per kind, then one row per requirement with its
        state in the answer (``succ``: the order found; ``core``: requirements that cannot all
        hold; ``unmet``: preferences given up)."""
        from satorder.render.requirement_rows import requirement_counts, requirement_rows

        self.section("Requirements")
        self.table(["kind", "count", "meaning"], requirement_counts(problem),
                   caption="Requirements by kind", numeric={"count"})
        rows = list(islice(requirement_rows(problem, succ, core, unmet), limit + 1))
        shown = rows[:limit]
        self.table(["#", "requirement", "in the answer"],
                   [(k, text, st) for k, (_, text, st) in enumerate(shown, 1)],
                   caption="Each requirement", numeric={"#"})
        if len(rows) > limit:
            self.text(f"Only the first {limit} requirements are listed (core members first); "
                      "the counts above cover all of them.", note=True)
        return self

    # ------------------------------------------------------------------ output
    def html(self) -> str:
        return ("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
                f"<title>{escape(self.title)}</title><style>{STYLE}</style></head>\n<body>\n"
                + "\n".join(self.parts) + "\n</body></html>\n")

    def write(self, path: str) -> None:
        atomic_write(path, self.html())
