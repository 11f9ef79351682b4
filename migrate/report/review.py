"""The review: review.html (numbers, charts, every job, filters, search by class) and one
self-contained page per job (review/<script>.html) with the script beside its Java.

Built from report.json and the files it names (the legacy sources under report["source"], the
scripts in the output folder), so `convert` and `verify` write the same page. No network: the
CSS, the script and the charts (SVG drawn here) are inline; every source text is escaped.
Python lines that carry a `# File.java:NN` comment link to those Java lines, and back.
"""
from __future__ import annotations

import html
import json
import re
from collections import Counter
from pathlib import Path

from pygments import lex
from pygments.formatters.html import HtmlFormatter, _get_ttype_class
from pygments.lexers import JavaLexer, PythonLexer

from migrate.java.source import read_inside
from migrate.report.render import checked_label, where

_STEP = re.compile(r"#\s+([\w$]+\.java):(\d+)")
STATUS_COLOURS = {"converted": "#2f7d32", "partial": "#b7791f", "not_converted": "#b42318"}


def highlighted_lines(code: str, lexer) -> list[str]:
    """The code as HTML lines (pygments token classes), each line closed on its own."""
    lines: list[str] = [""]
    for ttype, value in lex(code, lexer):
        css = _get_ttype_class(ttype)
        for i, piece in enumerate(value.split("\n")):
            if i:
                lines.append("")
            if piece:
                text = html.escape(piece, quote=False)
                lines[-1] += f'<span class="{css}">{text}</span>' if css else text
    if lines and lines[-1] == "" and code.endswith("\n"):
        lines.pop()
    return lines


_PY_PIECES: dict[str, list[str]] = {}


def highlighted_python(script: str) -> list[str]:
    """highlighted_lines of a script, one top-level statement at a time, each distinct one lexed once
    per process (scripts share their helpers; the lexer starts every top-level statement afresh)."""
    import ast

    try:
        body = ast.parse(script).body
    except SyntaxError:
        body = []
    lines = script.splitlines(keepends=True)
    if not body or not script.endswith("\n"):
        return highlighted_lines(script, PythonLexer(stripnl=False))
    cuts = sorted({0, *(min([n.lineno, *(d.lineno for d in getattr(n, "decorator_list", []))]) - 1 for n in body),
                   len(lines)})
    out: list[str] = []
    for a, b in zip(cuts, cuts[1:]):
        piece = "".join(lines[a:b])
        got = _PY_PIECES.get(piece)
        if got is None:
            if len(_PY_PIECES) > 4096:
                _PY_PIECES.clear()
            got = _PY_PIECES[piece] = highlighted_lines(piece, PythonLexer(stripnl=False))
        out += got
    return out


def _files_of(job: dict) -> list[str]:
    """The job's Java files (paths relative to the source root), each once, in the report's order."""
    return list(dict.fromkeys(span.rpartition(":")[0] for span in job["files"].values()))


_HIGHLIGHTED: dict[str, list[str]] = {}  # a Java file's lines as HTML, made once per process


def _java_lines(source: Path, path: str) -> list[str]:
    key = f"{source}\0{path}"
    got = _HIGHLIGHTED.get(key)
    if got is None:
        if len(_HIGHLIGHTED) > 512:  # a shard's files, not the repository's
            _HIGHLIGHTED.clear()
        got = _HIGHLIGHTED[key] = highlighted_lines(_java_text(source, path), JavaLexer(stripnl=False))
    return got


def _java_text(source: Path, path: str) -> str:
    """A Java file's text for the page, read as the scan read it (a regular file, within the size limit)."""
    try:
        return read_inside(source, path).decode("utf-8", "replace").replace("\r\n", "\n").replace("\r", "\n")
    except OSError as exc:  # gone, not a regular file, over the limit: say so instead
        return f"// {path}: not shown ({exc})\n"


NO_SCRIPT = "# (no script: this code could not be read or converted; see the item on the left)\n"


def _job_section(k: int, job: dict, source: Path, script: str, shown: dict | None = None) -> str:
    """The job's Java beside its script. `shown`: text put in place of the effort and the verdict (a
    worker writes the page before the repository's estimate exists)."""
    files = _files_of(job)
    by_name = {Path(p).name: i for i, p in enumerate(files)}
    py_lines = highlighted_python(script)
    raw_py = script.splitlines()
    links: dict[str, list[str]] = {}  # java line id -> python line ids
    py_html = []
    for n, (line, raw) in enumerate(zip(py_lines, raw_py), 1):
        pid = f"j{k}-py-{n}"
        targets = [f"j{k}-f{by_name[m.group(1)]}-{m.group(2)}" for m in _STEP.finditer(raw) if m.group(1) in by_name]
        for t in targets:
            links.setdefault(t, []).append(pid)
        attr = f' data-java="{" ".join(targets)}" class="ln step"' if targets else ' class="ln"'
        py_html.append(f'<div id="{pid}"{attr}><span class="no">{n}</span>{line or " "}</div>')
    hand_by_line: dict[tuple[str, int], list[dict]] = {}
    for h in job["hand_work"]:
        hand_by_line.setdefault((h["file"], h["line"]), []).append(h)
    java_html = []
    placed: set[tuple[str, int]] = set()  # hand-work lines shown inline
    for i, path in enumerate(files):
        java_html.append(f'<div class="file">{html.escape(path)}</div>')
        for n, line in enumerate(_java_lines(source, path), 1):
            jid = f"j{k}-f{i}-{n}"
            py = links.get(jid, [])
            attr = f' data-py="{" ".join(py)}" class="ln linked"' if py else ' class="ln"'
            java_html.append(f'<div id="{jid}"{attr}><span class="no">{n}</span>{line or " "}</div>')
            for h in hand_by_line.get((path, n), []):
                placed.add((path, n))
                java_html.append(
                    f'<div class="hw" data-category="{html.escape(h["category"])}"><b>{html.escape(h["category"])}'
                    f'</b>: {html.escape(h["reason"])}<br><i>suggestion:</i> {html.escape(h["suggestion"])}</div>')
    loose = [h for h in job["hand_work"] if (h["file"], h["line"]) not in placed]
    cats = sorted({h["category"] for h in job["hand_work"]})
    shown = shown or {"effort": f'{job["effort_hours"]:.1f}', "verdict": html.escape(checked_label(job))}
    head = (f'<h2>{html.escape(job["name"])} <span class="badge {job["status"]}">{job["status"]}</span></h2>'
            f'<p class="meta"><code>{html.escape(job["driver"])}</code> → <code>{html.escape(job["script"])}</code>'
            f' · {html.escape(", ".join(job["shapes"]))} · effort {shown["effort"]} h'
            f' · hand work: {len(job["hand_work"])} · checked against Hadoop: {shown["verdict"]}</p>')
    extra = "".join(f'<div class="hw"><b>{html.escape(h["category"])}</b> at {html.escape(where(h["file"], h["line"]))}: '
                    f'{html.escape(h["reason"])}</div>' for h in loose)
    return (f'<section class="job" id="job-{k}" data-status="{job["status"]}" data-categories="{" ".join(cats)}" '
            f'tabindex="-1">{head}{extra}<div class="pair"><div class="java code">{"".join(java_html)}</div>'
            f'<div class="python code">{"".join(py_html)}</div></div></section>')


def _bar_chart(title: str, rows: list[tuple[str, float, str]], unit: str = "") -> str:
    """A horizontal bar chart as inline SVG: (label, value, colour) rows."""
    width, bar_h, label_w = 560, 18, 230
    top = max((v for _, v, _ in rows), default=0) or 1
    h = 28 + len(rows) * (bar_h + 6)
    parts = [f'<svg class="chart" role="img" aria-label="{html.escape(title)}" width="{width}" height="{h}" '
             f'viewBox="0 0 {width} {h}" xmlns="http://www.w3.org/2000/svg">',
             f'<text x="0" y="16" class="ct">{html.escape(title)}</text>']
    for i, (label, value, colour) in enumerate(rows):
        y = 28 + i * (bar_h + 6)
        w = (width - label_w - 70) * value / top
        parts.append(f'<text x="0" y="{y + 13}" class="cl">{html.escape(label[:34])}</text>'
                     f'<rect x="{label_w}" y="{y}" width="{w:.1f}" height="{bar_h}" fill="{colour}"/>'
                     f'<text x="{label_w + w + 6:.1f}" y="{y + 13}" class="cv">{value:g}{unit}</text>')
    parts.append("</svg>")
    return "".join(parts)


EFFORT_BARS = 25  # the index charts the jobs of most effort; the table lists every job


def charts(report: dict) -> str:
    s = report["summary"]
    status = [(k.replace("_", " "), s[k], STATUS_COLOURS[k]) for k in ("converted", "partial", "not_converted")]
    cats = Counter(h["category"] for j in report["jobs"] for h in j["hand_work"])
    by_cat = [(c, n, "#5b6b8c") for c, n in cats.most_common()]
    effort = sorted(((j["name"], round(j["effort_hours"], 1), STATUS_COLOURS[j["status"]]) for j in report["jobs"]),
                    key=lambda r: -r[1])
    title = "Estimated effort per job (hours)" if len(effort) <= EFFORT_BARS else \
        f"Estimated effort: the {EFFORT_BARS} jobs of most effort (hours)"
    return (_bar_chart("Jobs by status", status) + _bar_chart("Hand-work items by category", by_cat)
            + _bar_chart(title, effort[:EFFORT_BARS], " h"))


_CSS = """
body{font:14px/1.4 system-ui,sans-serif;margin:0;color:#1d2433;background:#fafbfc}
header{padding:12px 20px;background:#1d2433;color:#fff;position:sticky;top:0;z-index:2}
header h1{font-size:18px;margin:0 0 6px}
header a{color:#cfe0ff}
.warn{background:#fff4e5;border-left:4px solid #b7791f;padding:8px 12px;margin:12px 20px}
.filters label{margin-right:12px}
main{padding:0 20px 40px}
.summary{display:flex;flex-wrap:wrap;gap:16px}
.job{margin-top:12px;padding-top:8px;scroll-margin-top:var(--header,120px)}
.badge{font-size:12px;padding:2px 8px;border-radius:10px;color:#fff;vertical-align:middle}
.badge.converted{background:#2f7d32}.badge.partial{background:#b7791f}.badge.not_converted{background:#b42318}
.meta{color:#4a5568;margin:2px 0 8px}
.pair{display:grid;grid-template-columns:minmax(0,1fr) minmax(0,1fr);gap:8px}
.code{font:12px/1.45 ui-monospace,monospace;background:#fff;border:1px solid #d0d7e2;overflow:auto;max-height:75vh}
.ln{white-space:pre;padding:0 6px}
.ln .no{display:inline-block;width:3.5em;color:#8a94a6;user-select:none}
.step,.linked{cursor:pointer}
.step:hover,.linked:hover{background:#eef4ff}
.ln.hl{background:#fff3b0}
.file{background:#eef1f6;padding:2px 6px;font-weight:600}
.hw{background:#fdecea;border-left:3px solid #b42318;margin:2px 6px 4px 4em;padding:4px 8px;white-space:normal}
.chart .ct{font-weight:600;font-size:13px}.chart .cl,.chart .cv{font-size:12px}
table.jobs{border-collapse:collapse;width:100%;margin-top:16px;background:#fff}
table.jobs th,table.jobs td{border-bottom:1px solid #e2e7ef;padding:4px 8px;text-align:left;vertical-align:top}
table.jobs th{background:#eef1f6;position:sticky;top:var(--header,120px)}
table.jobs td.num{text-align:right}
.hidden{display:none}
"""

_PAGE_JS = """
(function(){
  var head=document.querySelector('header');
  function pad(){document.documentElement.style.setProperty('--header',(head.offsetHeight+8)+'px');}
  pad();window.addEventListener('resize',pad);
  function clear(){[].forEach.call(document.querySelectorAll('.ln.hl'),function(e){e.classList.remove('hl');});}
  function mark(ids){var first=null;ids.forEach(function(id){var e=document.getElementById(id);
    if(e){e.classList.add('hl');first=first||e;}});if(first){first.scrollIntoView({block:'center'});}}
  document.addEventListener('click',function(ev){var l=ev.target.closest('.ln');if(!l)return;
    var to=l.getAttribute('data-java')||l.getAttribute('data-py');if(!to)return;clear();l.classList.add('hl');
    mark(to.split(' '));});
  document.addEventListener('keydown',function(ev){var t=ev.target;if(t.tagName==='INPUT'||t.tagName==='SELECT')return;
    var a=document.querySelector(ev.key==='j'||ev.key==='n'?'a[rel=next]':ev.key==='k'||ev.key==='p'?'a[rel=prev]':
      ev.key==='u'?'a[rel=index]':'none');if(a){a.click();}});
})();
"""

_INDEX_JS = """
(function(){
  var head=document.querySelector('header');
  function pad(){document.documentElement.style.setProperty('--header',(head.offsetHeight+8)+'px');}
  pad();window.addEventListener('resize',pad);
  var rows=[].slice.call(document.querySelectorAll('table.jobs tbody tr'));
  function filter(){var on=[].slice.call(document.querySelectorAll('.filters input[type=checkbox]:checked')).map(function(e){return e.value;});
    var cat=document.getElementById('category').value, q=document.getElementById('search').value.trim().toLowerCase();
    var shown=0;
    rows.forEach(function(r){var ok=on.indexOf(r.getAttribute('data-status'))>=0&&
      (!cat||(' '+r.getAttribute('data-categories')+' ').indexOf(' '+cat+' ')>=0)&&
      (!q||r.getAttribute('data-classes').indexOf(q)>=0);r.classList.toggle('hidden',!ok);if(ok)shown++;});
    document.getElementById('shown').textContent=shown;}
  [].forEach.call(document.querySelectorAll('.filters input,.filters select'),function(e){
    e.addEventListener(e.type==='search'?'input':'change',filter);});
})();
"""

_HEAD = ("<!DOCTYPE html><html lang=\"en\"><head><meta charset=\"utf-8\">"
         "<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'; "
         "script-src 'unsafe-inline'; img-src data:\">")
_CODE_STYLE = HtmlFormatter(style="default").get_style_defs(".code")


def page_name(job: dict, k: int) -> str:
    """The job's page, beside the index: review/<script>.html (review/entry-<k>.html without a script)."""
    return f"review/{Path(job['script']).stem}.html" if job["script"] else f"review/entry-{k}.html"


def nav_links(prev: str | None, nxt: str | None) -> str:
    """Links to the index and to the previous and next job pages (names relative to a job page)."""
    return ('<a rel="index" href="../review.html">all jobs</a>'
            + (f' · <a rel="prev" href="{prev}">previous</a>' if prev else "")
            + (f' · <a rel="next" href="{nxt}">next</a>' if nxt else "")
            + " · keys: j / k next and previous job, u all jobs · click a line to see where it came from")


def job_page(job: dict, source: Path, script: str | None, repository: str, warning: str,
             shown: dict | None = None, nav: str = "") -> str:
    """One job's self-contained page: its Java beside its script, lines linked both ways.
    `nav`: nav_links to the pages around it."""
    section = _job_section(0, job, source, script if script is not None else NO_SCRIPT, shown)
    links = nav
    return (f"{_HEAD}<title>{html.escape(job['name'])}: mrlift review of {html.escape(repository)}</title>"
            f"<style>{_CSS}{_CODE_STYLE}</style></head><body><header><h1>mrlift review: {html.escape(repository)}"
            f"</h1><div class=\"nav\">{links}</div></header><div class=\"warn\"><b>{html.escape(warning)}</b></div>"
            f"<main>{section}</main><script>{_PAGE_JS}</script></body></html>")


def index_page(report: dict) -> str:
    """review.html: the numbers, the charts and every job, with filters and a search by class name;
    each job links to its own page."""
    s = report["summary"]
    cats = sorted({h["category"] for j in report["jobs"] for h in j["hand_work"]})
    e = report["effort"]
    filters = ("".join(f'<label><input type="checkbox" value="{k}" checked> {k.replace("_", " ")}</label>'
                       for k in ("converted", "partial", "not_converted"))
               + '<label>hand work: <select id="category"><option value="">any</option>'
               + "".join(f'<option value="{html.escape(c)}">{html.escape(c)}</option>' for c in cats)
               + '</select></label><label>class: <input type="search" id="search" placeholder="name of a class"></label>'
               + f' showing <span id="shown">{len(report["jobs"])}</span> of {len(report["jobs"])}')
    summary = (f"<p>{s['jobs']} jobs: {s['converted']} converted, {s['partial']} partial, {s['not_converted']} not "
               f"converted; {s.get('verified', 0)} checked against Hadoop with the same output. Estimated effort "
               f"<b>{e['hours']:.1f} h</b> (range {e['range_hours'][0]:.1f} to {e['range_hours'][1]:.1f} h, "
               f"{html.escape(e['model'])}). {html.escape(e['caveat'])}</p>")
    rows = []
    for k, j in enumerate(report["jobs"]):
        names = " ".join(sorted({j["driver"], *j["classes"].values()} - {""})).lower()
        rows.append(
            f'<tr data-status="{j["status"]}" data-categories="{html.escape(" ".join(sorted({h["category"] for h in j["hand_work"]})))}" '
            f'data-classes="{html.escape(names)}"><td><a href="{html.escape(page_name(j, k))}">{html.escape(j["name"])}</a></td>'
            f'<td><code>{html.escape(j["driver"])}</code></td><td><code>{html.escape(j["script"])}</code></td>'
            f'<td><span class="badge {j["status"]}">{j["status"]}</span></td><td>{html.escape(", ".join(j["shapes"]))}</td>'
            f'<td class="num">{len(j["hand_work"])}</td><td class="num">{j["effort_hours"]:.1f}</td>'
            f'<td>{html.escape(checked_label(j))}</td></tr>')
    table = ('<table class="jobs"><thead><tr><th>job</th><th>driver</th><th>script</th><th>status</th><th>shapes</th>'
             '<th>hand work</th><th>effort (h)</th><th>checked against Hadoop</th></tr></thead><tbody>'
             + "".join(rows) + "</tbody></table>")
    data = html.escape(json.dumps({"summary": s, "effort_hours": e["hours"]}), quote=False)
    return (f"{_HEAD}<title>mrlift review: {html.escape(report['repository'])}</title><style>{_CSS}</style></head>"
            f"<body><header><h1>mrlift review: {html.escape(report['repository'])}</h1><div class=\"filters\">{filters}"
            f"</div></header><div class=\"warn\"><b>{html.escape(report['warning'])}</b></div><main>{summary}"
            f"<div class=\"summary\">{charts(report)}</div>{table}</main>"
            f"<script type=\"application/json\" id=\"report-numbers\">{data}</script><script>{_INDEX_JS}</script>"
            "</body></html>")


def neighbours(report: dict, k: int) -> tuple[str | None, str | None]:
    """The pages before and after job k, as links from a job page."""
    jobs = report["jobs"]
    prev = page_name(jobs[k - 1], k - 1).removeprefix("review/") if k > 0 else None
    nxt = page_name(jobs[k + 1], k + 1).removeprefix("review/") if k + 1 < len(jobs) else None
    return prev, nxt


def render_review(report: dict, out_dir: Path) -> dict[str, str]:
    """The index and every job's page, read from report.json's data, the scripts in `out_dir` and the
    legacy sources: {file name in the output folder: page}."""
    source = Path(report.get("source") or ".")
    pages = {"review.html": index_page(report)}
    for k, j in enumerate(report["jobs"]):
        path = out_dir / j["script"] if j["script"] else None
        script = path.read_text(encoding="utf-8") if path is not None and path.is_file() else None
        pages[page_name(j, k)] = job_page(j, source, script, report["repository"], report["warning"],
                                          nav=nav_links(*neighbours(report, k)))
    return pages
