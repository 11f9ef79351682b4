"""The conversion report: report.json (data) and report.md (for people), deterministic."""
from __future__ import annotations

import json

from migrate.lift.job import JobResult
from migrate.plan import Join
from migrate.report.effort import DEFAULT, JobEffort, Model, repository_hours
from migrate.java.source import MAX_FILE_BYTES, ParseFailure

VERIFY_WARNING = ("Generated jobs must be verified on real data before they replace production jobs: "
                  "run the original and the script on the same representative input and compare the outputs.")
EFFORT_CAVEAT = ("Effort follows COCOMO II.2000 (post-architecture, reuse and automatic-translation terms), "
                 "calibrated on whole projects; for repositories under about 2 KSLOC the figures are indicative only. "
                 "ESLOC counts legacy Java lines, not PySpark lines.")


def job_effort(job: JobResult, name: str) -> JobEffort:
    return JobEffort(name, job.sloc_total, tuple((h.profile, h.sloc, h.category) for h in job.plan.hand_work))


UNREAD_WORDS = {"file": "the file could not be read", "driver": "the driver's job could not be read",
                "job": "the job could not be converted", "hive": "another engine's job", "pig": "another engine's job",
                "streaming": "another engine's job", "workflow": "jobs chained outside Java"}


def where(file: str, line: int | None) -> str:
    """`file:line`, or the file and "whole file" where no line applies."""
    return f"{file}:{line}" if line is not None else f"{file} (whole file)"


def _unread_sloc(source: str | None, path: str, max_bytes: int) -> tuple[int, int]:
    """SLOC and line count of a file that was not converted (0, 0 where it cannot be read as text)."""
    from pathlib import Path

    from migrate.java.source import logical_sloc, read_inside

    try:
        text = read_inside(Path(source or "."), path, max_bytes).decode("utf-8", "replace")
    except OSError:  # not a regular file, gone, over the limit: nothing to count
        return 0, 0
    lines = text.replace("\r\n", "\n").split("\n")
    return logical_sloc(lines), len(lines)


def unread_entry(u, hours: float, sloc: int, lines: int) -> dict:
    """A `not_converted` job entry for code that could not be read or converted at all, or that
    another engine runs (Hive, Pig, streaming, Oozie)."""
    from migrate.inventory import SUGGESTIONS

    e = u.error
    other = u.kind in SUGGESTIONS  # another engine's job source, listed as it is
    return {
        "name": f"{u.name} (not read)" if u.kind == "file" else u.name,
        "kind": f"other-{u.kind}" if other else f"not-read-{u.kind}",
        "driver": u.name if u.kind not in ("file", *SUGGESTIONS) else "", "script": "", "status": "not_converted",
        "classes": {}, "files": {"source": f"{e.path}:1-{lines}"} if lines else {}, "shapes": [], "arguments": [],
        "hand_work": [{"category": u.category, "file": e.path, "line": e.line,
                       "reason": f"{UNREAD_WORDS[u.kind]}: {e.message}",
                       "suggestion": SUGGESTIONS[u.kind] if other else "fix what the message names (javac must "
                                     "accept the file) and run mrlift again, or translate the code by hand",
                       "snippet": "", "profile": u.profile, "sloc": sloc}],
        "notes": [], "reduce_tasks": None, "task_files": False, "layout": "", "findings": [], "aggregates": [], "inputs": [],
        "join": None, "side_tables": [], "chain": [], "counters": [], "comparison": "bytes", "verification": None,
        "sloc": {"total": sloc, "automatic": 0, "hand": sloc}, "effort_hours": round(hours, 2),
    }


def job_entry(job: JobResult, script: str) -> tuple[dict, JobEffort]:
    """A job's report entry (its effort hours are the repository estimate's, added by assemble_report)."""
    mode = job.spec.mode
    eff = job_effort(job, script)
    return {
        "name": job.spec.name + (f" (args[{mode.index}] {mode.label if mode.value is None else repr(mode.value)})"
                                 if mode is not None else ""),
        "driver": job.spec.driver.fqcn,
        # a driver that picks its job by an argument: the value of that argument this job runs for
        "mode": {"argument": mode.index, "value": mode.value, "line": mode.line,
                 "tests": [{"literal": lit, "ignore_case": ic} for lit, ic in mode.tests]} if mode is not None else None,
        "script": script,
        "status": job.status,
        "classes": {role: fq for role, fq in sorted(job.classes.items())},
        "files": {role: str(span) for role, span in sorted(job.files.items())},
        "shapes": list(job.plan.shapes),
        "arguments": [{"name": p.name, "position": p.position, "from_end": p.from_end, "many": p.many,
                       "derived": bool(p.derived), "default": p.default, "help": p.help}
                      for p in job.plan.params],
        "hand_work": [{"category": h.category, "file": h.origin.file, "line": h.origin.line_start,
                       "reason": h.reason, "suggestion": h.suggestion, "snippet": h.snippet,
                       "profile": h.profile, "sloc": h.sloc} for h in job.plan.hand_work],
        "notes": list(job.plan.notes),
        "reduce_tasks": job.spec.reduces,
        "task_files": job.plan.sink.partition is not None,  # the script can write one file per task
        "layout": layout_of(job),
        "findings": [{"category": f.category, "file": f.origin.file, "line": f.origin.line_start,
                      "finding": f.message, "suggestion": f.suggestion} for f in job.plan.findings],
        "aggregates": aggregates_of(job),
        "inputs": inputs_of(job),
        "join": join_of(job),
        "side_tables": side_tables_of(job),
        "chain": chain_of(job),
        "counters": counters_of(job),
        "comparison": comparison_of(job),  # what `mrlift verify` may compare: what the original defines
        "verification": None,  # filled by `mrlift verify`
        "sloc": {"total": eff.sloc_total, "automatic": eff.sloc_auto, "hand": eff.sloc_manual},
    }, eff


def assemble_report(entries: list[tuple[dict, JobEffort]], errors: list[ParseFailure], root_label: str,
                    source: str | None = None, model: Model | None = None, unread: list | None = None,
                    max_file_bytes: int | None = None) -> dict:
    """The report as plain data (what report.json holds) from the jobs' entries (job_entry), each given its
    share of the repository estimate; `model`: the effort constants (default: published); `unread`: code
    that could not be read or converted at all (scan.Unread), each a not_converted entry."""
    model = model or DEFAULT
    efforts = [eff for _, eff in entries]
    unread = list(unread or [])
    seen: set[str] = set()
    unread_sloc = []  # a file's lines count once, whatever number of entries name it
    for u in unread:
        sloc, lines = _unread_sloc(source, u.error.path, max_file_bytes or MAX_FILE_BYTES)
        sloc = u.sloc if u.sloc is not None else sloc
        unread_sloc.append((0 if u.error.path in seen else sloc, lines))
        seen.add(u.error.path)
    unread_efforts = [JobEffort(f"(not read) {k}", sloc, ((u.profile, sloc,
                                                           u.category),))
                      for k, (u, (sloc, _)) in enumerate(zip(unread, unread_sloc))]
    est = repository_hours(efforts + unread_efforts, model)
    out_jobs = []
    for entry, eff in entries:
        out_jobs.append({**entry, "effort_hours": round(est["jobs"][eff.name], 2)})
    for u, eff, (sloc, lines) in zip(unread, unread_efforts, unread_sloc):
        out_jobs.append(unread_entry(u, est["jobs"][eff.name], sloc, lines))
    counts = {s: sum(1 for j in out_jobs if j["status"] == s) for s in ("converted", "partial", "not_converted")}
    return {
        "tool": "mrlift",
        "repository": root_label,
        "source": source,  # the legacy sources, for `mrlift verify` to compile
        "warning": VERIFY_WARNING,
        "summary": {"jobs": len(out_jobs), **counts, "errors": len(errors), "not_read": len(unread), "verified": 0},
        "jobs": out_jobs,
        "errors": [{"file": e.path, "line": e.line, "message": e.message} for e in errors],
        "effort": {
            "model": "COCOMO II.2000",
            "hours": round(est["hours"], 2),
            "range_hours": [round(est["range"][0], 2), round(est["range"][1], 2)],
            "esloc": round(est["esloc"], 1),
            "hours_per_person_month": model.hours_per_pm,
            "caveat": EFFORT_CAVEAT,
            # every constant with where it came from: published, mrlift's default, or the user's file
            "constants": [{"name": k, "value": list(v) if isinstance(v, tuple) else v, "basis": model.basis[k]}
                          for k, v in (("a", model.a), ("b", model.b), ("sum_sf", model.sum_sf),
                                       ("atprod", model.atprod), ("hours_per_pm", model.hours_per_pm),
                                       ("range", model.range), ("su", model.su), ("unfm", model.unfm))]
            + [{"name": f"profile {n}", "value": [p.dm, p.cm, p.im, p.aa], "basis": model.basis["profiles"]}
               for n, p in model.profiles.items()]
            + [{"name": f"category {c}", "value": prof, "basis": "your file"} for c, prof in model.category_profiles.items()],
            "pert": {"categories": {c: list(t) for c, t in model.pert.items()}, "hours": round(est["pert_hours"], 2),
                     "sigma": round(est["pert_sigma"], 2)},
        },
    }


AGGREGATE_WORDS = {"sum": "F.sum", "count": "F.count", "count_if": "F.count_if (conditional count)",
                   "min": "F.min", "max": "F.max", "min_nan": "F.min, NaN if any value is NaN (Math.min)",
                   "min_nonnan": "F.min over non-NaN values (`<` comparison)",
                   "max_nonnan": "F.max over non-NaN values (`>` comparison)", "any": "F.bool_or",
                   "all": "F.bool_and", "count_distinct": "F.count_distinct (set size)",
                   "only": "the one value of the key (the script stops if values differ: the last is not defined)"}


def aggregates_of(job: JobResult) -> list[dict]:
    """Each reducer accumulator and the aggregate it became, with its Java line."""
    from migrate.plan import Group, Runs, TopN, dump_expr

    r = job.plan.reduce
    fold = r.fold if isinstance(r, (TopN, Runs)) else r
    if not isinstance(fold, Group):
        return []
    return [{"accumulator": a.name, "java_type": a.jtype, "aggregate": AGGREGATE_WORDS.get(a.fn, a.fn),
             "over": dump_expr(a.arg) if a.arg is not None else "every value", "file": a.origin.file,
             "line": a.origin.line_start, "java": a.note} for a in fold.aggs]


def counters_of(job: JobResult) -> list[dict]:
    """What each Hadoop counter counted, from the plan's Count steps."""
    from migrate.plan import Count, dump_expr

    from migrate.plan import EachValue, Group

    r = job.plan.reduce
    per_value = [s for s in getattr(r, "lets", ()) if isinstance(s, Count)] if isinstance(r, (Group, EachValue)) else []
    per_call = list(r.counts) if isinstance(r, Group) else []
    out = []
    for s in list(job.plan.map_steps) + per_value + per_call:
        if isinstance(s, Count):
            what = "reduce() calls (keys)" if s in per_call else "values reduce() reads" if s in per_value else "records"
            rows = f"{what} where {dump_expr(s.cond)}" if s.cond is not None else \
                f"every {'reduce() call' if s in per_call else 'value' if s in per_value else 'record'} that reaches this line"
            amount = "" if dump_expr(s.amount) == "1" else f", adding {dump_expr(s.amount)} each"
            group, name = (None if isinstance(v, str) else dump_expr(v) for v in (s.group, s.name))
            shared = any(f.category == "combiner-counters" and f"{s.group}:{s.name}" in f.message
                         for f in job.plan.findings) and s in per_value + per_call
            out.append({"group": s.group if group is None else None, "name": s.name if name is None else None,
                        **({"combiner_too": True} if shared else {}),
                        **({"group_from": group} if group else {}), **({"name_from": name} if name else {}),
                        "file": s.origin.file, "line": s.origin.line_start, "counts": rows + amount})
    return out


def to_json(report: dict) -> str:
    return json.dumps(report, indent=2, ensure_ascii=False, sort_keys=False) + "\n"


class _SafeCsv:
    """A csv writer whose text cells cannot run as spreadsheet formulas: a cell starting with
    = + - @ TAB or CR gets a leading apostrophe (the OWASP "CSV injection" advice). Numbers
    are written as numbers."""

    def __init__(self, writer):
        self.writer = writer

    def writerow(self, row: list) -> None:
        self.writer.writerow([f"'{c}" if isinstance(c, str) and c[:1] in ("=", "+", "-", "@", "\t", "\r") else c
                              for c in row])


def md_cell(text) -> str:
    """Text for one cell of a Markdown table: no line breaks, no column separators."""
    return " ".join(str(text).split()).replace("|", "\\|")


def to_csv(report: dict) -> str:
    """effort.csv: a row per job, then a row per hand-work item (for spreadsheets)."""
    import csv
    import io

    buf = io.StringIO()
    w = _SafeCsv(csv.writer(buf, lineterminator="\n"))
    w.writerow(["row", "job", "script", "status", "verdict", "category", "file", "line", "profile", "sloc",
                "effort_hours", "reason"])
    for j in report["jobs"]:
        verdict = (j.get("verification") or {}).get("verdict", "unverified")
        w.writerow(["job", j["name"], j["script"], j["status"], verdict, "", "", "", "", j["sloc"]["total"],
                    f"{j['effort_hours']:.2f}", ""])
        for h in j["hand_work"]:
            w.writerow(["hand-work", j["name"], j["script"], j["status"], verdict, h["category"], h["file"],
                        "whole file" if h["line"] is None else h["line"],
                        h["profile"], h["sloc"], "", h["reason"]])
    e = report["effort"]
    w.writerow(["repository", report["repository"], "", "", "", "", "", "", "", "", f"{e['hours']:.2f}",
                f"range {e['range_hours'][0]:.2f} to {e['range_hours'][1]:.2f} h ({e['model']})"])
    return buf.getvalue()


INLINE_DETAIL = 60  # up to this many jobs, report.md holds every job's detail; beyond, a file per job


def detail_name(job: dict, k: int) -> str:
    """The file of a job's detail beside report.md: report/<script>.md (report/entry-<k>.md without one)."""
    return f"report/{job['script'].removesuffix('.py')}.md" if job["script"] else f"report/entry-{k}.md"


def markdown_files(report: dict) -> dict[str, str]:
    """report.md, and for a repository of more than INLINE_DETAIL jobs the jobs' detail files."""
    if len(report["jobs"]) <= INLINE_DETAIL:
        return {"report.md": to_markdown(report)}
    files = {"report.md": to_markdown(report, detail=False)}
    for k, j in enumerate(report["jobs"]):
        section = _detail(j)
        if section:
            files[detail_name(j, k)] = "\n".join(["[all jobs](../report.md)", "", *section])
    return files


def to_markdown(report: dict, detail: bool = True) -> str:
    """report.md; `detail`: each job's hand work, findings and notes here (else in its own file, linked)."""
    s = report["summary"]
    out = [f"# mrlift conversion report: {report['repository']}", "",
           f"> **{report['warning']}**", "",
           f"{s['jobs']} jobs: {s['converted']} converted, {s['partial']} partial, {s['not_converted']} not converted."
           + (f" {s['not_read']} of the not converted are code that could not be read or converted at all (a file, a "
              "driver or a job), each listed with its reason." if s.get("not_read") else "")
           + (f" {s['errors']} error entries are listed at the end." if s["errors"] else ""), "",
           *([f"Compile check: {report['settings']['compile_check']}." + (
               f" Not checked (a library they import is missing): {', '.join(report['settings']['not_compiled'])}."
               if report["settings"].get("not_compiled") else ""), ""] if report.get("settings") else []),
           "| job | driver | script | status | checked against Hadoop | shapes | hand-work items | effort (h) |",
           "|---|---|---|---|---|---|---|---|"]
    for k, j in enumerate(report["jobs"]):
        name = md_cell(j["name"]) if detail or not _detail(j) else f"[{md_cell(j['name'])}]({detail_name(j, k)})"
        out.append(f"| {name} | `{md_cell(j['driver'])}` | `{md_cell(j['script'] or '(none)')}` | "
                   f"{j['status']} | {md_cell(checked_label(j))} | {md_cell(', '.join(j['shapes']))} | "
                   f"{len(j['hand_work'])} | {j['effort_hours']:.1f} |")
    e = report["effort"]
    out += ["", f"Estimated effort for the repository: **{e['hours']:.1f} h** "
                f"(range {e['range_hours'][0]:.1f} to {e['range_hours'][1]:.1f} h). {e['caveat']}", ""]
    if e.get("constants"):
        out += ["<details><summary>Effort model constants and where each comes from</summary>", "",
                "| constant | value | basis |", "|---|---|---|"]
        out += [f"| {c['name']} | {c['value']} | {c['basis']} |" for c in e["constants"]]
        for cat, (o, m, p_) in e["pert"]["categories"].items():
            out.append(f"| PERT hours per `{cat}` item | {o} / {m} / {p_} | your file |")
        if e["pert"]["categories"]:
            out.append(f"| PERT total | {e['pert']['hours']} h, σ {e['pert']['sigma']} h | (O + 4M + P) / 6 |")
        out += ["", "</details>", ""]
    if detail:
        for j in report["jobs"]:
            out += _detail(j)
    if report["errors"]:
        out += ["## Files not read", ""]
        out += [f"- `{where(e['file'], e['line'])}`: {e['message']}" for e in report["errors"]]
        out.append("")
    return "\n".join(out)


def _detail(j: dict) -> list[str]:
    """A job's section: its hand work, findings, inputs, chain, side files, aggregates, notes, counters."""
    out: list[str] = []
    v = j.get("verification") or {}
    if not (j["hand_work"] or j["notes"] or j["counters"] or j["findings"] or j["aggregates"] or j["inputs"]
            or j["side_tables"] or j["chain"] or j.get("layout") or v.get("verdict") in ("error", "differs")):
        return []
    out += [f"## {md_cell(j['name'])} ({j['status']})", ""]
    if j.get("layout"):
        out.append(f"- layout: {LAYOUT_TEXT[j['layout']].format(n=j['reduce_tasks'])}")
    if v.get("verdict") in ("error", "differs"):
        out.append(f"- **checked against Hadoop: {v['verdict']}**: {v['detail']} ({v['checked_at']})")
        for d in (v.get("comparison") or {}).get("differences", []):
            out.append(f"  - line {d['line']}: original `{d['original']}`, script `{d['converted']}`")
        if v.get("log"):
            out += ["", "```", v["log"], "```", ""]
    for h in j["hand_work"]:
        out += [f"- **{h['category']}** at `{where(h['file'], h['line'])}`: {h['reason']}",
                f"  - code: `{h['snippet']}`" if h["snippet"] else "  - code: (see file)",
                f"  - suggestion: {h['suggestion']}"]
    for f in j["findings"]:
        out += [f"- **finding: {f['category']}** at `{f['file']}:{f['line']}`: {f['finding']}",
                f"  - to decide: {f['suggestion']}"]
    for i in j["inputs"]:
        out.append(f"- input `{i['argument']}` read as {i['format']}, mapped by `{i['mapper']}`")
    for c in j["chain"]:
        out.append(f"- job {c['job']} `{c['name']}` reads {c['reads']} and writes {c['writes']}")
    for t in j["side_tables"]:
        out.append(f"- side file `{t['argument']}` read in setup() (`{t['file']}:{t['line']}`) into the "
                   f"{t['java_type']} `{t['field']}`; looked up per record: a broadcast left join")
    for side in (j["join"] or {}).get("sides", []):
        out.append(f"- join side `{side['name']}` (`{side['file']}:{side['line']}` `{side['java']}`): "
                   f"{side['kind']}")
    for a in j["aggregates"]:
        out.append(f"- accumulator `{a['accumulator']}` ({a['java_type']}, `{a['file']}:{a['line']}` "
                   f"`{a['java']}`) became {a['aggregate']} over `{a['over']}`")
    for n in j["notes"]:
        out.append(f"- note: {n}")
    for c in j["counters"]:
        group = c["group"] if c["group"] is not None else f"[{c['group_from']}]"
        name = c["name"] if c["name"] is not None else f"[{c['name_from']}]"
        out.append(f"- counter `{group}:{name}` (`{c['file']}:{c['line']}`) counts {c['counts']}")
    out.append("")
    return out


def checked_label(j: dict) -> str:
    """A job's verification in a few words; a converted job without a passing check is unverified."""
    v = j.get("verification")
    if not v or v["verdict"] == "skipped":
        return "unverified" + (f" ({v['detail']})" if v else "")
    ran = f"; arguments {' '.join(v['arguments'])}" if v.get("arguments") else ""
    if v.get("tolerance") is not None:
        ran += f"; relative tolerance {v['tolerance']:g}"
    if v["verdict"] == "agrees":
        return f"agrees ({v['detail']}; data {v['data']}{ran}, {v['checked_at']})"
    return f"**{v['verdict']}**: {v['detail']} ({v['checked_at']})"


def comparison_of(job) -> str:
    """How far the original defines its output: bytes, lines within a key, lines, or keys only."""
    from migrate.plan import EachValue, Identity

    cats = {h.category for h in job.plan.hand_work}
    if "combiner" in cats:
        return "keys"  # the original's values depended on how often its combiner ran
    if "output-layout" in cats:
        return "lines"
    within_key = isinstance(job.plan.reduce, (Join, Identity)) or \
        isinstance(job.plan.reduce, EachValue) and _keys_per_call(job.plan.reduce)
    if isinstance(job.plan.reduce, EachValue) and not within_key:
        return "lines"  # one call's lines, in no defined order, are written under keys of their own values
    if layout_of(job) == "one file":  # the original's part files, each sorted, are not reproduced
        return "lines" if within_key else "part-files"
    return "within-key" if within_key else "bytes"


LAYOUT_TEXT = {"reproduced": "reproduced ({n} part files: one file holding them one after another, or with "
                              "--task-files one file per reduce task)",
               "one file": "one file instead of {n} (sorted by key; which key went to which part file is not "
                           "reproduced; the lines and each part file's order are)"}


def _keys_per_call(r) -> bool:
    """Does every written key depend on the reduce key alone (or the call's first value), so that
    the lines of one reduce() call, in no defined order, share their written key?"""
    from migrate.plan import Col, Let, walk

    lets = {x.name: x.expr for x in r.lets if isinstance(x, Let)}

    def per_call(e) -> bool:
        cols = {c.name for c in walk(e) if isinstance(c, Col)}
        return all(c in ("key", "first_value") or c in lets and per_call(lets[c]) for c in cols)

    return all(e.key is None or per_call(e.key) for e in r.emits)


def layout_of(job) -> str:
    """How the script lays out the original's part files: "reproduced" (one file, the part files
    one after another, or one per task with --task-files), "one file" (sorted by key; which key went
    to which reduce task is not reproduced), or "" (one reduce task, or map only)."""
    if job.spec.reduces <= 1 or job.plan.reduce is None:
        return ""
    return "reproduced" if job.plan.sink.partition is not None else "one file"


def inputs_of(job) -> list[dict]:
    """MultipleInputs: each input's script argument, format and mapper (the pipeline's first steps)."""
    return [{"argument": b.source.params[0], "format": b.source.fmt, "mapper": b.mapper} for b in job.plan.branches]


def chain_of(job) -> list[dict]:
    """Chained jobs: each job, what it reads and where its output goes."""
    plans = [st.plan for st in job.plan.upstream]
    if not plans:
        return []
    plans.append(job.plan)
    outs = [f"`{st.output.name}` (passed on in memory; written with --keep-intermediates)" for st in job.plan.upstream]
    outs.append(f"`{job.plan.sink.param}`")
    return [{"job": k, "name": q.job_name, "writes": outs[k - 1],
             "reads": f"job {q.source.upstream + 1}'s lines" if q.source.upstream is not None
             else ", ".join(f"`{x}`" for x in q.source.params)} for k, q in enumerate(plans, 1)]


def side_tables_of(job) -> list[dict]:
    """Map-side joins: each side file, where setup() reads it, and the field it fills."""
    return [{"argument": t.param, "field": t.field, "java_type": "HashSet" if t.kind == "set" else "HashMap",
             "file": t.origin.file, "line": t.origin.line_start} for t in job.plan.tables]


def join_of(job) -> dict | None:
    """A reduce-side join: its sides (how values were told apart) and the join it amounts to."""
    r = job.plan.reduce
    if not isinstance(r, Join):
        return None
    return {"kind": next((s for s in job.plan.shapes if s.startswith("reduce-side join")), "reduce-side join"),
            "sides": [{"name": s.name, "file": s.origin.file, "line": s.origin.line_start, "java": s.note,
                       "kind": "every value of its tag (a list)" if s.many else
                       f"one value of its tag (default {s.default!r}; two different ones stop the script)"}
                      for s in r.sides]}
