"""Read a driver's Job / JobConf calls into a JobSpec: classes, types, formats, paths, conf, reducers."""
from __future__ import annotations


from dataclasses import dataclass, field, replace

from javalang import tree as T

from migrate.java.index import ClassIndex, ClassInfo, node_lines
from migrate.java.literals import argument_test, string_value
from migrate.plan import Span


@dataclass(frozen=True)
class PathRef:
    """Where a job path comes from: `args[i]` of the driver, a literal, or something unreadable."""

    # "arg" | "args" (a run of arguments, from a loop over them) | "literal" | "computed" (made at run
    # time: from arguments, or held in a local; `text` says how, and names it) | "unknown"
    kind: str
    index: int | None = None  # "arg": args[index]; "args": the run's first argument
    literal: str | None = None
    text: str = ""
    split_commas: bool = False  # FileInputFormat's String overloads read "a,b" as two paths
    # "arg": args[args.length - from_end] (index None); "args": the run stops from_end before the end
    from_end: int | None = None
    # "computed" from arguments and literals alone: its pieces in order, ("arg", i) or ("str", text)
    parts: tuple[tuple[str, object], ...] | None = None

    @property
    def shown(self) -> str:
        """How the driver names the argument(s): `args[1]`, `args[args.length - 1]`, `args[0 .. length - 2]`."""
        if self.kind == "arg" and self.from_end is not None:
            return f"args[args.length - {self.from_end}]"
        if self.kind == "arg":
            return f"args[{self.index}]"
        if self.kind == "args":
            return f"args[{self.index} .. args.length - {self.from_end + 1}]"
        return self.literal if self.kind == "literal" else self.text


@dataclass(frozen=True)
class CacheFile:
    """A file shipped to every task (the distributed cache): its path and the `#name` link, if any."""

    path: PathRef
    line: int
    link: str | None = None


@dataclass(frozen=True)
class ChainLink:
    """One class of a ChainMapper / ChainReducer chain with the key/value classes it declares."""

    role: str  # "map" (ChainMapper.addMapper), "reduce" (ChainReducer.setReducer), "map-after" (ChainReducer.addMapper)
    cls: str
    types: tuple[str, str, str, str]  # input key, input value, output key, output value (fully qualified)
    line: int
    own_conf: bool  # the link gets a Configuration with settings of its own


@dataclass(frozen=True)
class Mode:
    """A driver that configures different jobs by the value of one argument (`if
    (args[0].equals("combiner")) ... else if ...`, or a `switch`): this job is the branch the driver
    takes when args[index] is `value` (None: a value that none of the tests accepts). Any argument
    that gives the same answer to every one of the driver's tests takes the same branch."""

    index: int
    value: str | None
    tests: tuple[tuple[str, bool], ...]  # (literal, ignore_case) of every test of args[index], in order
    line: int  # the first test

    @property
    def label(self) -> str:
        return self.value if self.value is not None else "other"


@dataclass
class JobSpec:
    """What a driver configures for one MapReduce job."""

    driver: ClassInfo
    method: str  # "main" or "run"
    name: str
    api: str
    origin: Span
    classes: dict[str, str] = field(default_factory=dict)  # role -> fully qualified class
    types: dict[str, str] = field(default_factory=dict)  # map_key/map_value/out_key/out_value -> fqcn
    input_format: str | None = None
    output_format: str | None = None
    inputs: list[PathRef] = field(default_factory=list)
    output: PathRef | None = None
    conf: dict[str, str] = field(default_factory=dict)
    num_reduces: int | None = None
    deletes_output: bool = False
    unread: list[tuple[int, str]] = field(default_factory=list)  # (line, call text) the reader skipped
    call_lines: dict[str, int] = field(default_factory=dict)  # job method name -> line of the call
    submitted_at: list[int] = field(default_factory=list)  # lines that submit this job
    usage: tuple[int, str, str, int] | None = None  # the usage check before it: (line, stream, text, exit code)
    replaced: list[tuple[int, str, str, str]] = field(default_factory=list)  # (line, call, earlier, later) class
    extra: list[tuple[str, int, str]] = field(default_factory=list)  # (category, line, text) needing hand work
    optional: set[str] = field(default_factory=set)  # settings made only when an optional argument is given
    # what the driver prints after the job from its counters: (line, pieces), a piece ("str", text) or
    # ("counter", findCounter's argument nodes); `println` ends it with a line break
    prints: list[tuple[int, tuple, bool]] = field(default_factory=list)
    # MultipleInputs.addInputPath: one (path, input format, mapper) per input, each with its own mapper
    branches: list[tuple[PathRef, str, str, int]] = field(default_factory=list)  # (path, format, mapper, line)
    # ChainMapper.addMapper / ChainReducer.setReducer / ChainReducer.addMapper, in call order
    chain: list[ChainLink] = field(default_factory=list)
    # job.addCacheFile / DistributedCache.addCacheFile, in order: what getCacheFiles()[i] is in a task
    cache_files: list[CacheFile] = field(default_factory=list)
    mode: Mode | None = None  # the branch of a driver that picks its job by an argument

    @property
    def reduces(self) -> int:
        """Number of reduce tasks (Hadoop's default is 1)."""
        return 1 if self.num_reduces is None else self.num_reduces


_JOB_CALLS = {
    "setMapperClass": "mapper", "setReducerClass": "reducer", "setCombinerClass": "combiner",
    "setPartitionerClass": "partitioner", "setSortComparatorClass": "sort_comparator",
    "setOutputKeyComparatorClass": "sort_comparator", "setGroupingComparatorClass": "grouping_comparator",
    "setOutputValueGroupingComparator": "grouping_comparator",
}
_TYPE_CALLS = {"setMapOutputKeyClass": "map_key", "setMapOutputValueClass": "map_value",
               "setOutputKeyClass": "out_key", "setOutputValueClass": "out_value"}
# Configuration-key constants of Hadoop library classes (Hadoop 3 javadoc, "Constant Field Values").
LIBRARY_CONSTANTS = {
    ("RegexMapper", "PATTERN"): "mapreduce.mapper.regex",
    ("RegexMapper", "GROUP"): "mapreduce.mapper.regexmapper..group",
    ("KeyValueLineRecordReader", "KEY_VALUE_SEPARATOR"): "mapreduce.input.keyvaluelinerecordreader.key.value.separator",
    ("TextOutputFormat", "SEPARATOR"): "mapreduce.output.textoutputformat.separator",
}
MAX_ARGUMENTS = 255  # a driver reading args[N] beyond this is not a command line mrlift rebuilds
_CONF_SETTERS = {"set", "setInt", "setLong", "setBoolean", "setFloat", "setDouble", "setStrings"}
_HARMLESS = {"setJarByClass", "setJar", "waitForCompletion", "submit", "setJobName", "exit", "println", "printf",
             "getInstance", "getConfiguration", "getRemainingArgs", "runJob", "print", "run", "getFileSystem", "get",
             "exists", "monitorAndPrintJob", "setSpeculativeExecution", "setMapSpeculativeExecution",
             "setReduceSpeculativeExecution", "printUsage", "printGenericCommandUsage", "setConf", "getConf",
             "isSuccessful", "currentTimeMillis"}
# Calls that read what a finished job left: its counters, or files (its output) opened by the driver.
_AFTER_JOB = {"getCounters", "open", "listStatus", "globStatus", "getJobState"}
# Calls and classes that change files (Hadoop FileSystem, java.io.File, java.nio.file.Files): in a
# driver, I/O outside the job's own output, which a script that only writes the output does not do.
_FILE_CHANGES = {"deleteOnExit", "renameTo", "mkdirs", "createNewFile", "copyFromLocalFile", "copyToLocalFile",
                 "moveFromLocalFile", "moveToLocalFile", "writeString", "deleteIfExists", "createFile",
                 "createDirectory", "createDirectories", "createTempFile", "fullyDelete", "createSymlink"}
# Names that change files only on a file system or Files/FileUtil (`sb.append`, `URI.create` do not).
_FS_CHANGES = {"create", "append", "rename", "copy", "move", "write", "setPermission", "setOwner", "setReplication",
               "setTimes", "truncate", "concat", "mkdir"}
_FILE_WRITERS = {"FileWriter", "FileOutputStream", "PrintWriter", "PrintStream", "RandomAccessFile"}


def read_drivers(index: ClassIndex) -> tuple[list[JobSpec], list[tuple[ClassInfo, int, str]]]:
    """All jobs configured by driver classes, and (class, line, message) for drivers not read."""
    specs, problems = [], []
    for cls in index:
        if "driver" not in cls.roles:
            continue
        method = _entry_method(cls, index)
        if method is None:
            problems.append((cls, cls.line_start, "driver has no main(String[]) or run(String[]) that could be read"))
            continue
        try:
            found = _read_driver(cls, index, method)
            specs.extend(found)
            submits = submissions(cls)
            read = {line for spec in found for line in spec.submitted_at}
            unread = [line for line in submits if line not in read]
            if unread:  # never silence: a job that runs is a job in the report
                problems.append((cls, unread[0], "the driver submits a job (line "
                                 f"{', '.join(map(str, unread))}) that mrlift could not read"
                                 + (": which Job or JobConf it runs was not found" if not found else
                                    f" (it read {len(found)} job{'s' if len(found) != 1 else ''}: "
                                    f"{', '.join(s.name for s in found)})")))
        except (AttributeError, TypeError, ValueError, KeyError, IndexError, RecursionError) as exc:
            # an unforeseen driver shape must not stop the batch: it is reported with its line
            problems.append((cls, method.position.line if method.position else cls.line_start,
                             f"driver could not be read ({type(exc).__name__}: {exc})"))
    return specs, problems


MAX_MODES = 16  # more branches on one argument than this is not a mode switch mrlift splits


def _read_driver(cls: ClassInfo, index: ClassIndex, method) -> list[JobSpec]:
    """The driver's jobs. Where it picks what to configure by testing one argument against string
    literals, each branch is read on its own (the value fixed) and becomes its own job: reading every
    branch into one job would mix the classes of all of them."""
    reader = _DriverReader(cls, index)
    reader.run(method)
    indexes = {t[0] for t in reader.arg_tests}
    if len(indexes) != 1:
        return reader.jobs()
    (at,) = indexes
    tests = tuple(dict.fromkeys((lit, ic) for _, lit, ic, _ in reader.arg_tests))
    values = list(dict.fromkeys(lit for lit, _ in tests))
    if len(values) > MAX_MODES:
        return reader.jobs()
    specs = []
    for value in [*values, None]:
        branch = _DriverReader(cls, index, fixed=(at, value))
        branch.run(method)
        mode = Mode(at, value, tests, min(line for _, _, _, line in reader.arg_tests))
        for spec in branch.jobs():
            spec.mode = mode
            specs.append(spec)
    return specs


def _is_print(s) -> bool:
    e = getattr(s, "expression", None)
    return isinstance(e, T.MethodInvocation) and e.qualifier == "System.out" and e.member in ("println", "print")


def _shown(v: tuple) -> str:
    """A driver value as the report shows a path made from it."""
    return {"str": lambda: '"' + v[1] + '"', "arg": lambda: f"args[{v[1]}]"}.get(v[0], lambda: str(v[1]))()


def submissions(cls: ClassInfo) -> list[int]:
    """Lines of the class that submit a job: waitForCompletion, JobClient.runJob/submitJob (JobControl
    has its own item)."""
    lines = []
    for _, n in cls.node:
        if isinstance(n, T.MethodInvocation) and n.member in ("waitForCompletion", "runJob", "submitJob"):
            lines.append(_line(n) or cls.line_start)
    return sorted(set(lines))


def _entry_method(cls: ClassInfo, index: ClassIndex):
    runs = [m for m in cls.methods("run") if len(m.parameters) == 1]
    if "tool" in cls.roles and runs:
        return runs[0]
    mains = [m for m in cls.methods("main") if "static" in m.modifiers]
    return mains[0] if mains else (runs[0] if runs else None)


COMPRESS = "mapreduce.output.fileoutputformat.compress"
COMPRESS_CODEC = "mapreduce.output.fileoutputformat.compress.codec"


class _DriverReader:
    """Interprets driver statements symbolically; values are small tuples (kind, payload)."""

    def __init__(self, cls: ClassInfo, index: ClassIndex, fixed: tuple[int, str | None] | None = None):
        self.cls, self.index = cls, index
        self.fixed = fixed  # (i, value): args[i] is this value (None: one no test accepts); walk its branch only
        self.arg_tests: list[tuple[int, str, bool, int]] = []  # (i, literal, ignore_case, line) of branch tests
        self.skipped: list = []  # branches not taken under `fixed`
        self.stopped = False  # under `fixed`, the branch taken printed usage and left
        self.conditional: list[tuple[int, str]] = []  # (line, test) of job settings made under a test not read
        self.env: dict[str, tuple] = {}
        self.specs: dict[str, JobSpec] = {}
        self.order: list[str] = []
        self.submitted: list[str] = []
        self.method_name = "main"
        self.pending_delete: list[PathRef] = []  # paths deleted before any job names its output
        self.deletes: list[tuple[PathRef | None, int]] = []  # every delete: (the path if known, line)
        self.file_io: list[tuple[int, str]] = []  # (line, call) that change files other than by a delete
        self.pending_conf: dict[str, str] = {}  # settings made on a Configuration before the job exists
        self.optional_settings: set[str] = set()  # settings made only when an optional argument is given
        self.counter_reads: dict[int, str] = {}  # line of a getCounters() after the job -> the job
        self.counter_used: set[int] = set()  # those lines whose counters a print the script repeats reads
        self.counter_other: list[int] = []  # lines that use counters otherwise (not a print the script repeats)
        self.branch_depth = 0  # inside a branch the reader does not decide (or a loop over the arguments)
        self.usage: tuple[int, str, str, int] | None = None  # the driver's usage check, before any job

    # -- walking
    def run(self, method: T.MethodDeclaration) -> None:
        self.method_name = method.name
        if method.parameters:
            self.env[method.parameters[0].name] = ("args",)
        self._block(method.body or [])

    def jobs(self) -> list[JobSpec]:
        ids = [j for j in self.order if j in self.submitted] or self.order
        out = [self.specs[j] for j in ids] if not self.stopped else []
        outputs = {s.output for s in self.specs.values() if s.output is not None}
        changes = sorted(self.file_io + [(line, "a delete of " + (p.text or p.literal or "a path" if p is not None
                                                                  else "a file or folder"))
                                         for p, line in self.deletes if p is None or p not in outputs])
        for s in out:
            if not self.submitted:
                s.extra.append(("not-submitted", s.origin.line_start,
                                "the driver configures this job but never submits it (no waitForCompletion, submit "
                                "or JobClient.runJob was found): the original may write nothing"))
            for line, what in changes:
                s.extra.append(("io-outside-output", line, f"the driver changes files outside the job's output: "
                                                           f"{what}"))
        skipped = {line for node in self.skipped for line in _job_creations(node)}
        created = [line for line in _job_creations(self.cls) if line not in skipped]
        if len(created) > len(self.specs):
            unread = created[len(self.specs):] if self.specs else created
            for s in out:
                s.extra.append(("unread-jobs", unread[0],
                                f"the driver creates {len(created)} jobs and {len(self.specs)} of them could be read "
                                f"(not read: line {', '.join(map(str, unread))}): the driver's output may come from a "
                                "job the script does not run"))
        for s in out:
            s.optional = {k for k in self.optional_settings if k in s.conf}
            s.usage = self.usage
        for line, jid in self.counter_reads.items():  # counters read for something other than a print
            if line not in self.counter_used or self.counter_other:
                self.specs[jid].extra.append(("after-job", min([line, *self.counter_other]),
                                              "`getCounters(...)` after the job ran"))
        for line, test in self.conditional:
            for s in out:
                s.extra.append(("conditional-settings", line, f"the driver configures the job under `if ({test})`, a "
                                "test mrlift does not evaluate: which settings the original used depends on it, so "
                                "the script cannot follow one branch"))
        if len(out) > 1:
            for s in out:
                s.extra.append(("chained-jobs", s.origin.line_start,
                                f"the driver runs {len(out)} jobs in sequence; each is converted on its own"))
        return out

    def _block(self, stmts) -> None:
        for s in stmts or []:
            if self.stopped:
                return
            self._stmt(s)

    def _stmt(self, s) -> None:
        held = {n for n, v in self.env.items() if v[0] in ("counters", "counter", "count")}
        if held and not isinstance(s, T.LocalVariableDeclaration) and not _is_print(s) and \
                any(isinstance(n, T.MemberReference) and (n.member in held or n.qualifier in held) or
                    isinstance(n, T.MethodInvocation) and n.qualifier in held for _, n in s):
            self.counter_other.append(_line(s))
        if isinstance(s, T.LocalVariableDeclaration):
            for d in s.declarators:
                if d.initializer is not None:
                    v = self._value(d.initializer, d.name)
                    if v[0] == "path" and v[1].kind == "unknown":  # a folder made at run time (a random or
                        # timed name): the local names it, so the jobs that use it are seen to share it
                        v = ("path", PathRef("computed", text=f"`{d.name}` ({v[1].text}, line {_line(s)})"))
                    self.env[d.name] = v
        elif isinstance(s, T.StatementExpression):
            e = s.expression
            if isinstance(e, T.Assignment) and isinstance(e.expressionl, T.MemberReference):
                v = self._value(e.value, e.expressionl.member)
                if self.branch_depth and self.env.get(e.expressionl.member) == ("args",):
                    return  # `if (args.length == 0) args = new String[] {...}`: a fallback; given ones count
                self.env[e.expressionl.member] = v
            else:
                self._value(e, None)
        elif isinstance(s, T.IfStatement) and self._branch_on_argument(s):
            return
        elif isinstance(s, T.IfStatement) and self._optional_argument(s):
            return
        elif isinstance(s, T.SwitchStatement) and self._switch_on_argument(s):
            return
        elif isinstance(s, T.IfStatement):
            if self.usage is None and not self.order and s.else_statement is None:
                self.usage = self._usage(s)
            submits = any(isinstance(n, T.MethodInvocation) and n.member in _SUBMITS for _, n in s.condition)
            branches = [b for b in (s.then_statement, s.else_statement) if b is not None and not _exits(b)]
            if not submits and any(_sets_job(b) for b in branches):
                self.conditional.append((_line(s), _text(s.condition)))
            self._value(s.condition, None)  # `if (!job.waitForCompletion(true))` submits the job
            self.branch_depth += 1  # what prints here prints only sometimes
            if not _exits(s.then_statement):
                self._stmt(s.then_statement)
            if s.else_statement is not None:
                self._stmt(s.else_statement)
            self.branch_depth -= 1
        elif isinstance(s, T.ForStatement) and self._argument_loop(s):
            return
        elif isinstance(s, T.BlockStatement):
            self._block(s.statements)
        elif isinstance(s, T.TryStatement):
            self._block(s.block)
        elif isinstance(s, T.ReturnStatement) and s.expression is not None:
            self._value(s.expression, None)

    def _usage(self, s: T.IfStatement) -> tuple[int, str, str, int] | None:
        """`if (args.length < 2) { System.err.println("Usage: ..."); System.exit(2); }` before any job:
        (line, stream, the text printed, exit code), where every statement is a print of a literal or
        the exit; else None."""
        c = s.condition
        if not (isinstance(c, T.BinaryOperation) and c.operator in ("<", "<=", "!=", "==", ">", ">=")
                and ("arglen", 0) in (self._value(c.operandl, None), self._value(c.operandr, None))):
            return None
        body = s.then_statement.statements if isinstance(s.then_statement, T.BlockStatement) else [s.then_statement]
        text, stream, code = "", None, None
        for st in body:
            e = getattr(st, "expression", None)
            if not isinstance(e, T.MethodInvocation) or code is not None:
                return None
            args = e.arguments or []
            if e.member == "exit" and e.qualifier == "System" and len(args) == 1:
                v = self._value(args[0], None)
                if v[0] != "int":
                    return None
                code = v[1] & 0xFF  # the process exit status the shell sees
                continue
            value = self._value(args[0], None) if len(args) == 1 else ("none",)
            if e.qualifier not in ("System.err", "System.out") or e.member not in ("println", "print", "printf") \
                    or value[0] != "str" or stream not in (None, e.qualifier):
                return None
            stream = e.qualifier
            piece = value[1].replace("%n", "\n").replace("%%", "%") if e.member == "printf" else value[1]
            if e.member == "printf" and "%" in value[1].replace("%n", "").replace("%%", ""):
                return None  # a format with arguments
            text += piece + ("\n" if e.member == "println" else "")
        return (_line(s), "stderr" if stream == "System.err" else "stdout", text, code) \
            if code is not None and text else None

    def _optional_argument(self, s: T.IfStatement) -> bool:
        """`if (args.length == 4) conf.set(name, args[3]);` (also `>=`, `>`): a setting made from an
        argument only when there are enough of them: an optional argument. False: not that form."""
        c = s.condition
        if s.else_statement is not None or not isinstance(c, T.BinaryOperation) or c.operator not in ("==", ">=", ">"):
            return False
        left, right = self._value(c.operandl, None), self._value(c.operandr, None)
        if not (left == ("arglen", 0) and right[0] == "int"):
            return False
        needed = right[1] + (c.operator == ">")  # the number of arguments the branch needs
        body = s.then_statement.statements if isinstance(s.then_statement, T.BlockStatement) else [s.then_statement]
        for st in body:
            e = getattr(st, "expression", None)
            if not (isinstance(e, T.MethodInvocation) and e.member in _CONF_SETTERS and len(e.arguments or []) == 2
                    and self._value(e.arguments[1], None) == ("arg", needed - 1)):
                return False
        before = dict(self.pending_conf), {j: dict(x.conf) for j, x in self.specs.items()}
        for st in body:
            self._stmt(st)
        names = {k for k in self.pending_conf if before[0].get(k) != self.pending_conf[k]}
        names |= {k for j, x in self.specs.items() for k in x.conf if before[1].get(j, {}).get(k) != x.conf[k]}
        self.optional_settings |= names
        return True

    def _argument_loop(self, s: T.ForStatement) -> bool:
        """`for (int i = a; i < args.length - k; i++)` (also `<=`, `++i`, `i += 1`): the body once, with
        args[i] standing for the run of arguments a .. length - k - 1 (Hadoop's WordCount takes every
        argument but the last as an input this way). False: not such a loop."""
        c = s.control
        if not isinstance(c, T.ForControl) or not isinstance(c.init, T.VariableDeclaration) or \
                len(c.init.declarators) != 1 or not isinstance(c.condition, T.BinaryOperation):
            return False
        i = c.init.declarators[0].name
        start = self._value(c.init.declarators[0].initializer, None)
        end = self._value(c.condition.operandr, None)
        left = c.condition.operandl
        steps = c.update or []
        step = steps[0] if len(steps) == 1 else None
        unit = isinstance(step, T.MemberReference) and step.member == i and not step.qualifier and \
            (step.postfix_operators or step.prefix_operators or []) == ["++"] or \
            isinstance(step, T.Assignment) and step.type == "+=" and getattr(step.expressionl, "member", None) == i \
            and getattr(step.value, "value", None) == "1"
        if _job_creations(s.body) or any(isinstance(n, T.MethodInvocation) and n.member in _SUBMITS for _, n in s.body):
            return False  # a job made or run per iteration: not a loop over paths
        if not (unit and start[0] == "int" and start[1] >= 0 and end[0] in ("arglen", "int")
                and isinstance(left, T.MemberReference) and left.member == i and not left.qualifier
                and c.condition.operator in ("<", "<=")):
            return False
        if end[0] == "int":  # known bounds (an array of literals): the body once per index, in order
            stop = end[1] + (c.condition.operator == "<=")
            if stop - start[1] > MAX_ARGUMENTS:
                return False
        else:  # the run ends this many arguments before the end
            stop = -end[1] - (c.condition.operator == "<=")
            if stop < 0:
                return False
        saved = self.env.get(i)
        if end[0] == "int":
            for k in range(start[1], stop):
                self.env[i] = ("int", k)
                self._stmt(s.body)
        else:
            self.env[i] = ("argloop", start[1], stop)
            self.branch_depth += 1
            self._stmt(s.body)
            self.branch_depth -= 1
        if saved is None:
            self.env.pop(i, None)
        else:
            self.env[i] = saved
        return True

    # -- branches on an argument (modes)
    def _branch_on_argument(self, s: T.IfStatement) -> bool:
        """`if (args[i].equals("v")) ... else ...` whose branches configure a job: record the test;
        when args[i] is fixed, walk only the branch taken. False: not such a test."""
        test = self._arg_test(s.condition)
        if test is None or not _configures(s):
            return False
        i, lit, ignore_case, negated = test
        self.arg_tests.append((i, lit, ignore_case, _line(s)))
        if self.fixed is None or self.fixed[0] != i:
            return False
        taken = argument_test(self.fixed[1], lit, ignore_case) != negated
        chosen, other = (s.then_statement, s.else_statement) if taken else (s.else_statement, s.then_statement)
        if other is not None:
            self.skipped.append(other)
        if chosen is not None:
            if _exits(chosen):
                self.stopped = True
            else:
                self._stmt(chosen)
        return True

    def _switch_on_argument(self, s: T.SwitchStatement) -> bool:
        """`switch (args[i]) { case "v": ... }`: each case label is a test (String.equals); when args[i]
        is fixed, walk from the case taken (or default) to the first break, as Java does."""
        v = self._value(s.expression, None)
        labels = [c.case for c in s.cases]
        literals = [[string_value(x.value) for x in lab if isinstance(x, T.Literal) and x.value.startswith('"')]
                    for lab in labels]
        if v[0] != "arg" or any(len(lits) != len(lab) for lits, lab in zip(literals, labels)) \
                or not any(_configures(st) for c in s.cases for st in c.statements):
            return False
        for lits in literals:
            self.arg_tests += [(v[1], lit, False, _line(s)) for lit in lits]
        if self.fixed is None or self.fixed[0] != v[1]:
            for c in s.cases:  # as before: every case read (the first pass only collects the tests)
                self._block([st for st in c.statements if not isinstance(st, T.BreakStatement)])
            return True
        value = self.fixed[1]
        start = next((k for k, lits in enumerate(literals) if value in lits), None)
        if start is None:
            start = next((k for k, lab in enumerate(labels) if not lab), None)  # `default:`
        if start is None:
            self.skipped.extend(s.cases)
            return True
        self.skipped.extend(s.cases[:start])
        for k, c in enumerate(s.cases[start:], start):
            stmts = list(c.statements)
            cut = next((j for j, st in enumerate(stmts) if isinstance(st, T.BreakStatement)), None)
            if _exits(T.BlockStatement(statements=stmts[:cut] if cut is not None else stmts)) and stmts:
                self.stopped = True
                return True
            self._block(stmts[:cut] if cut is not None else stmts)
            if cut is not None or self.stopped:
                self.skipped.extend(s.cases[k + 1:])
                break
        return True

    def _arg_test(self, e) -> tuple[int, str, bool, bool] | None:
        """(i, literal, ignore_case, negated) of `args[i].equals("v")`, `"v".equalsIgnoreCase(args[i])`,
        `mode.equals("v")` after `String mode = args[i]`, or `!` before any of them."""
        negated = (getattr(e, "prefix_operators", None) or []).count("!") % 2 == 1
        sels = list(getattr(e, "selectors", None) or [])
        if sels and isinstance(sels[-1], T.MethodInvocation):
            call = sels[-1]
            if isinstance(e, T.MemberReference):
                recv = self._value(T.MemberReference(member=e.member, qualifier=e.qualifier, selectors=sels[:-1],
                                                     prefix_operators=[], postfix_operators=[]), None)
            elif isinstance(e, T.Literal) and len(sels) == 1:
                recv = self._value(T.Literal(value=e.value, selectors=[], prefix_operators=[], postfix_operators=[]),
                                   None)
            else:
                return None
        elif isinstance(e, T.MethodInvocation) and e.qualifier and not sels:
            call, recv = e, self.env.get(e.qualifier, ("unknown", e.qualifier))
        else:
            return None
        if call.member not in ("equals", "equalsIgnoreCase") or len(call.arguments or []) != 1:
            return None
        other = self._value(call.arguments[0], None)
        pair = {recv[0]: recv, other[0]: other}
        if set(pair) != {"arg", "str"}:
            return None
        return pair["arg"][1], pair["str"][1], call.member == "equalsIgnoreCase", negated

    # -- expressions
    def _value(self, e, target: str | None) -> tuple:
        if isinstance(e, T.Literal):
            v = e.value
            if v.startswith('"'):
                return ("str", string_value(v))
            if v.lstrip("-").isdigit():
                return ("int", -int(v) if (e.prefix_operators or []) == ["-"] else int(v))
            return ("lit", v)
        if isinstance(e, T.MemberReference) and (e.qualifier, e.member) in LIBRARY_CONSTANTS:
            return ("str", LIBRARY_CONSTANTS[(e.qualifier, e.member)])
        if isinstance(e, T.MemberReference) and e.member == "length" and self.env.get(e.qualifier) == ("args",) \
                and not e.selectors:
            return ("arglen", 0)  # args.length (+ an offset once arithmetic is done on it)
        if isinstance(e, T.MemberReference) and e.member == "length" and not e.selectors and \
                self.env.get(e.qualifier, ("",))[0] == "strs":
            return ("int", len(self.env[e.qualifier][1]))
        if isinstance(e, (T.ArrayInitializer, T.ArrayCreator)):  # `{"in", "out"}`, `new String[] {"in", "out"}`
            items = e.initializers if isinstance(e, T.ArrayInitializer) else \
                (e.initializer.initializers if e.initializer is not None else None)
            values = [self._value(x, None) for x in items or []] if items is not None else None
            if values is not None and all(v[0] == "str" for v in values):
                return ("strs", tuple(v[1] for v in values))
            return ("unknown", "array")
        if isinstance(e, T.MemberReference):
            base = self.env.get(e.member, ("unknown", e.member)) if not e.qualifier else ("unknown", f"{e.qualifier}.{e.member}")
            for sel in e.selectors or []:
                at = self._value(sel.index, None) if isinstance(sel, T.ArraySelector) and base[0] == "args" else None
                if at is not None and at[0] == "int" and 0 <= at[1] <= MAX_ARGUMENTS:
                    base = ("arg", at[1])
                elif at is not None and at[0] == "arglen" and -MAX_ARGUMENTS <= at[1] < 0:
                    base = ("arg_end", -at[1])  # args[args.length - k]
                elif at is not None and at[0] == "argloop":
                    base = ("arg_run", at[1], at[2])  # args[i] for every i of a loop over the arguments
                elif isinstance(sel, T.ArraySelector) and base[0] == "strs":  # an array of literals
                    at = self._value(sel.index, None)
                    base = ("str", base[1][at[1]]) if at[0] == "int" and 0 <= at[1] < len(base[1]) \
                        else ("unknown", "array element")
                elif isinstance(sel, T.ArraySelector):
                    base = ("unknown", "array element")
            return base
        if isinstance(e, T.ClassCreator):
            tname = e.type.name
            if tname == "Path" and e.arguments:
                return ("path", self._path_ref(self._value(e.arguments[0], None), e))
            if tname in ("Job", "JobConf"):
                return self._new_job(e, target, e.arguments)
            if tname == "GenericOptionsParser":
                got: tuple = ("gop",)
                for sel in e.selectors or []:
                    if isinstance(sel, T.MethodInvocation):
                        got = self._call(got, sel, e)
                return got
            if tname in ("Configuration",):
                return ("conf",)
            simple = e.type
            while getattr(simple, "sub_type", None) is not None:  # `new java.io.PrintWriter(...)`
                simple = simple.sub_type
            if simple.name in _FILE_WRITERS:
                self.file_io.append((_line(e), f"`new {simple.name}(...)`"))
            for a in e.arguments or []:  # `new BufferedReader(new InputStreamReader(fs.open(…)))` reads a file
                self._value(a, None)
            for sel in e.selectors or []:
                if isinstance(sel, T.MethodInvocation):
                    return self._call(("obj", tname), sel, e)
            return ("obj", tname)
        if isinstance(e, T.MethodInvocation):
            return self._invocation(e, target)
        if isinstance(e, T.Cast):
            return self._value(e.expression, target)
        if isinstance(e, T.BinaryOperation):
            l, r = self._value(e.operandl, None), self._value(e.operandr, None)
            if e.operator == "+" and l[0] == "str" and r[0] == "str":
                return ("str", l[1] + r[1])
            if e.operator in ("+", "-") and {l[0], r[0]} == {"int", "arglen"} and not (e.operator == "-" and r[0] == "arglen"):
                step = r[1] if e.operator == "+" else -r[1]
                return ("arglen", l[1] + step) if l[0] == "arglen" else ("arglen", r[1] + l[1])
            if e.operator == "+" and {l[0], r[0]} <= {"str", "arg", "computed"} and {l[0], r[0]} != {"str"}:
                pieces = [x[2] if x[0] == "computed" else ((x[0], x[1]),) for x in (l, r)]
                parts = None if None in pieces else pieces[0] + pieces[1]
                # `args[1] + "_tmp"`: the same text, the same folder
                return ("computed", f"{_shown(l)} + {_shown(r)}", parts)
            if e.operator in ("+", "-") and l[0] == r[0] == "int":
                return ("int", l[1] + r[1] if e.operator == "+" else l[1] - r[1])
            return ("unknown", "expression")
        if isinstance(e, T.TernaryExpression):
            self._value(e.condition, None)  # `job.waitForCompletion(true) ? 0 : 1` submits the job
            return ("unknown", "conditional")
        return ("unknown", type(e).__name__)

    def _invocation(self, e: T.MethodInvocation, target: str | None) -> tuple:
        q = e.qualifier or ""
        if q in self.env:
            recv = self.env[q]
        elif q == "" or q == "this":
            recv = ("self",)
        elif q.split(".")[0] in ("Job",) and e.member == "getInstance":
            recv = ("static", "Job")
        else:
            recv = ("static", q)
        out = self._call(recv, e, e)
        for sel in e.selectors or []:
            if isinstance(sel, T.MethodInvocation):
                out = self._call(out, sel, e)
        return out

    def _call(self, recv: tuple, e: T.MethodInvocation, where) -> tuple:
        m, args = e.member, e.arguments or []
        line = _line(where)
        if m == "getInstance" and recv == ("static", "Job") or (m == "getInstance" and recv[1:] == ("Job",)):
            return self._new_job(where, None, args)
        if m == "getCounters" and recv[0] == "job" and recv[1] in self.submitted and not args:
            self.counter_reads.setdefault(line, recv[1])  # used by a print below, or hand work (jobs())
            return ("counters", recv[1], line)
        if m == "findCounter" and recv[0] == "counters" and len(args) in (1, 2):
            return ("counter", recv[1], recv[2], tuple(args))
        if m == "getValue" and recv[0] == "counter" and not args:
            return ("count", recv[1], recv[2], recv[3])
        if m in ("println", "print") and recv == ("static", "System.out") and len(args) == 1 and self._counter_print(
                args[0], line, m == "println"):
            return ("unknown", m)
        if m in _AFTER_JOB and self.submitted and (recv[0] == "job" or m != "getCounters"):
            # the driver reads the job's counters or its output back: a figure the script does not compute
            spec = self.specs[recv[1]] if recv[0] == "job" else self.specs[self.submitted[-1]]
            spec.extra.append(("after-job", line, f"`{m}(...)` after the job ran"))
            return ("unknown", m)
        if m == "exit" and recv == ("static", "System") and args:
            self._value(args[0], None)  # `System.exit(job.waitForCompletion(true) ? 0 : 1)`
            return ("unknown", m)
        if m == "getRemainingArgs" and recv[0] == "gop":
            return ("args",)
        if m in ("getConf", "getConfiguration") or recv[0] == "static" and m == "create" and recv[1] == "HBaseConfiguration":
            return ("conf", recv[1] if recv[0] == "job" else None)
        if m == "run" and recv[0] == "static" and recv[1] == "ToolRunner":
            tool = next((a for a in args if isinstance(a, T.ClassCreator)), None)
            if tool is not None:
                target_cls = self.index.get(self.index.resolve(tool.type.name, self.cls))
                if target_cls is not None:
                    runs = [mm for mm in target_cls.methods("run") if len(mm.parameters) == 1]
                    if runs:
                        self.method_name = "run"
                        saved = self.env
                        self.env = {runs[0].parameters[0].name: ("args",)}
                        self._block(runs[0].body)
                        self.env = saved
            return ("int", 0)
        if m == "runJob" and recv == ("static", "JobClient") and args:
            j = self._value(args[0], None)
            if j[0] == "job":
                self.specs[j[1]].call_lines.setdefault("runJob", line)
                self.specs[j[1]].submitted_at.append(line)
                self._submit(j[1])
            return ("unknown", "running job")
        if m in ("waitForCompletion", "submit") and recv[0] == "job":
            self.specs[recv[1]].call_lines.setdefault(m, line)
            self.specs[recv[1]].submitted_at.append(line)
            self._submit(recv[1])
            return ("unknown", "bool")
        if m == "delete" and not args:  # java.io.File.delete()
            self.deletes.append((None, line))
            return ("unknown", "bool")
        static = recv[1].split(".")[-1] if recv[0] == "static" else None
        if static == "ValueAggregatorJob" and m in ("createValueAggregatorJob", "createValueAggregatorJobs"):
            return self._aggregate_job(recv[1], where, args, line)
        if m in ("get", "getLocal", "newInstance") and static == "FileSystem" or m == "getFileSystem":
            for a in args:
                self._value(a, None)
            return ("fs",)
        if m in _FILE_CHANGES or m in _FS_CHANGES and (recv[0] == "fs" or static in ("Files", "FileUtil")):
            for a in args:
                self._value(a, None)
            self.file_io.append((line, f"`{m}(...)`"))
            return ("unknown", m)
        if m == "delete" and args:
            p = self._value(args[0], None)
            self.deletes.append((p[1] if p[0] == "path" else None, line))
            for spec in self.specs.values():
                if spec.output is not None and p[0] == "path" and p[1] == spec.output:
                    spec.deletes_output = True
            if p[0] == "path":
                self.pending_delete.append(p[1])
            return ("unknown", "bool")
        if recv[0] == "static" and recv[1].split(".")[-1] in ("FileInputFormat", "FileOutputFormat", "TextInputFormat",
                                                               "TextOutputFormat", "KeyValueTextInputFormat"):
            return self._format_call(recv[1].split(".")[-1], m, args, line)
        if recv[0] == "static" and recv[1].split(".")[-1] == "MultipleInputs" and m == "addInputPath" and len(args) == 4:
            j = self._value(args[0], None)
            if j[0] == "job":
                ref = self._path_ref(self._value(args[1], None), args[1])
                self.specs[j[1]].branches.append((ref, self._class_arg(args[2]), self._class_arg(args[3]), line))
                return ("unknown", m)
        if recv[0] == "static" and recv[1].split(".")[-1] == "DistributedCache" and m == "addCacheFile" and len(args) == 2:
            c = self._value(args[1], None)
            spec = self.specs.get(c[1]) if c[0] == "job" else self._only_spec() if c[0] == "conf" else None
            if spec is not None:
                spec.cache_files.append(self._cache_file(args[0], line))
                return ("unknown", m)
        if recv[0] == "static" and recv[1].split(".")[-1] in ("ChainMapper", "ChainReducer") and len(args) in (7, 8):
            j = self._value(args[0], None)
            if m in ("addMapper", "setReducer") and j[0] == "job":
                role = "reduce" if m == "setReducer" else "map" if recv[1].endswith("ChainMapper") else "map-after"
                types = tuple(self._class_arg(a) for a in args[2:6])
                spec = self.specs[j[1]]
                spec.chain.append(ChainLink(role, self._class_arg(args[1]), types, line, not _empty_conf(args[-1])))
                if role == "map":  # the chain's map output is the last mapper's (ChainMapper sets the job's types)
                    spec.types["map_key"], spec.types["map_value"] = types[2], types[3]
                elif role == "reduce":
                    spec.classes["reducer"] = spec.chain[-1].cls
                    spec.types.setdefault("out_key", types[2])
                    spec.types.setdefault("out_value", types[3])
                return ("unknown", m)
        if recv[0] == "static" and recv[1].split(".")[-1] in ("MultipleInputs", "MultipleOutputs", "ChainMapper",
                                                               "ChainReducer", "DistributedCache", "JobControl"):
            spec = self._only_spec()
            if spec is not None:
                spec.extra.append((_category_of(recv[1]), line, f"{recv[1].split('.')[-1]}.{m}(...)"))
            return ("unknown", m)
        if recv[0] == "job":
            return self._job_call(self.specs[recv[1]], m, args, line)
        if recv[0] == "conf":
            spec = self.specs.get(recv[1]) if len(recv) > 1 and recv[1] else self._conf_owner()
            if m in _CONF_SETTERS and len(args) >= 2:
                k, v = self._value(args[0], None), self._value(args[1], None)
                if spec is not None and k[0] == "str":
                    spec.conf[k[1]] = _conf_text(v)
                elif spec is None and k[0] == "str":
                    self.pending_conf[k[1]] = _conf_text(v)
            return ("unknown", m)
        if m not in _HARMLESS and recv[0] not in ("unknown", "obj", "static", "self"):
            spec = self._only_spec()
            if spec is not None:
                spec.unread.append((line, m))
        return ("unknown", m)

    def _new_job(self, where, target: str | None, args) -> tuple:
        jid = f"job{len(self.order)}"
        name = None
        for a in args or []:
            v = self._value(a, None)
            if v[0] == "str":
                name = v[1]
        start, end = node_lines(where)
        api = "mapred" if getattr(getattr(where, "type", None), "name", "") == "JobConf" else "mapreduce"
        spec = JobSpec(self.cls, self.method_name, name or self.cls.name, api,
                       Span(self.cls.file.path, start or self.cls.line_start, end or self.cls.line_end))
        spec.conf.update(self.pending_conf)
        self.specs[jid] = spec
        self.order.append(jid)
        return ("job", jid)

    def _counter_print(self, e, line: int, newline: bool) -> bool:
        """`System.out.println("bad: " + c.findCounter(Bad.ROW).getValue())`, the value perhaps held in a
        local first: literals and counter values joined with `+`. False where it is anything else."""
        pieces, stack, reads, ok = [], [e], set(), True
        while stack:
            x = stack.pop()
            if isinstance(x, T.BinaryOperation) and x.operator == "+":
                stack += [x.operandr, x.operandl]
                continue
            v = self._value(x, None)
            if v[0] == "str":
                pieces.append(("str", v[1]))
            elif v[0] == "count":
                pieces.append(("counter", v[3]))
                reads.add(v[2])
            else:
                ok = ok and v[0] not in ("counters", "counter")
                pieces.append(("other", None))
        # Java adds numbers before a String is met (`a + b + " x"` is a sum first): a String comes first
        jobs = {self.counter_reads[r] for r in reads} or ({self.submitted[-1]} if self.submitted else set())
        ok = ok and pieces[0][0] == "str" and all(p[0] != "other" for p in pieces) and len(jobs) == 1 \
            and not self.branch_depth
        if not ok:
            if reads:
                self.counter_other.append(line)
            return False
        self.counter_used |= reads  # literals alone after the job: part of the lines it prints
        self.specs[jobs.pop()].prints.append((line, tuple(pieces), newline))
        return True

    def _aggregate_job(self, builder: str, where, args, line: int) -> tuple:
        """Hadoop's aggregate framework builds the job itself (ValueAggregatorJob): its own mapper,
        combiner and reducer, driven by descriptor classes; input args[0] (a String: commas split
        it), output args[1], per ValueAggregatorJob.createValueAggregatorJob."""
        job = self._new_job(where, None, [])
        spec = self.specs[job[1]]
        fq = self.index.resolve(builder, self.cls) or builder
        package = "org.apache.hadoop.mapred.lib.aggregate" if ".mapred." in fq else "org.apache.hadoop.mapreduce.lib.aggregate"
        spec.api = "mapred" if ".mapred." in fq else "mapreduce"
        for role in ("mapper", "combiner", "reducer"):
            spec.classes[role] = f"{package}.ValueAggregator{role.capitalize()}"
        if args and self._value(args[0], None) == ("args",):
            spec.inputs.append(PathRef("arg", index=0, split_commas=True))
            spec.output = PathRef("arg", index=1)
        spec.extra.append(("job-builder", line, "Hadoop's aggregate framework (ValueAggregatorJob) builds this job: "
                                                "its own mapper, combiner and reducer run the aggregations that the "
                                                "descriptor classes' generateKeyValPairs() names"))
        return job

    def _submit(self, jid: str) -> None:
        if jid not in self.submitted:
            self.submitted.append(jid)
        spec = self.specs[jid]
        if spec.output is not None and spec.output in self.pending_delete:
            spec.deletes_output = True

    def _only_spec(self) -> JobSpec | None:
        return self.specs[self.order[-1]] if self.order else None

    def _conf_owner(self) -> JobSpec | None:
        return self._only_spec()

    def _job_call(self, spec: JobSpec, m: str, args, line: int) -> tuple:
        spec.call_lines.setdefault(m, line)
        if m in ("getConfiguration",):
            return ("conf", None)
        if m in _JOB_CALLS and args:
            role, cls = _JOB_CALLS[m], self._class_arg(args[0])
            if spec.classes.get(role) not in (None, cls):  # Hadoop keeps the last call's class
                spec.replaced.append((line, m, spec.classes[role], cls))
            spec.classes[role] = cls
        elif m in _TYPE_CALLS and args:
            spec.types[_TYPE_CALLS[m]] = self._class_arg(args[0])
        elif m in ("setInputFormatClass", "setInputFormat") and args:
            spec.input_format = self._class_arg(args[0])
        elif m in ("setOutputFormatClass", "setOutputFormat") and args:
            spec.output_format = self._class_arg(args[0])
        elif m == "setNumReduceTasks" and args:
            v = self._value(args[0], None)
            spec.num_reduces = v[1] if v[0] == "int" else None
            if v[0] != "int":
                spec.extra.append(("reducer-count", line, "number of reduce tasks is computed at run time"))
        elif m == "setJobName" and args:
            v = self._value(args[0], None)
            if v[0] == "str":
                spec.name = v[1]
        elif m in _CONF_SETTERS and len(args) >= 2:
            k, v = self._value(args[0], None), self._value(args[1], None)
            if k[0] == "str":
                spec.conf[k[1]] = _conf_text(v)
        elif m == "addCacheFile" and len(args) == 1:
            spec.cache_files.append(self._cache_file(args[0], line))
        elif m in ("addCacheArchive", "addFileToClassPath"):
            spec.extra.append(("side-files", line, f"job.{m}(...)"))
        elif m in ("setInputPath", "addInputPath"):
            spec.inputs.append(self._path_ref(self._value(args[0], None), args[0]))
        elif m == "setOutputPath":
            spec.output = self._path_ref(self._value(args[0], None), args[0])
        elif m not in _HARMLESS:
            spec.unread.append((line, m))
        return ("unknown", m)

    def _format_call(self, fmt: str, m: str, args, line: int) -> tuple:
        if not args:
            return ("unknown", m)
        j = self._value(args[0], None)
        if j[0] == "conf" and self.order:
            j = ("job", self.order[-1])
        if j[0] != "job":
            return ("unknown", m)
        spec = self.specs[j[1]]
        if m in ("addInputPath", "setInputPaths", "addInputPaths"):
            for a in args[1:]:
                v = self._value(a, None)
                ref = self._path_ref(v, a)
                if v[0] in ("str", "arg", "arg_end", "arg_run"):  # the String overloads split on commas; a Path does not
                    ref = replace(ref, split_commas=True)
                spec.inputs.append(ref)
        elif m == "setOutputPath" and len(args) > 1:
            spec.output = self._path_ref(self._value(args[1], None), args[1])
            if spec.output in self.pending_delete:
                spec.deletes_output = True
        elif m == "setCompressOutput" and len(args) > 1:  # FileOutputFormat stores it in the job's settings
            v = self._value(args[1], None)
            spec.conf[COMPRESS] = str(v[1]).lower() if v[0] == "lit" else f"<{v[1]}>"
        elif m == "setOutputCompressorClass" and len(args) > 1:
            spec.conf[COMPRESS_CODEC] = self._class_arg(args[1])
        elif m in ("setInputPathFilter", "setInputDirRecursive", "setMinInputSplitSize", "setMaxInputSplitSize"):
            spec.extra.append(("input-output-options", line, f"{fmt}.{m}(...)"))
        return ("unknown", m)

    def _class_arg(self, e) -> str:
        if isinstance(e, T.ClassReference):
            name = e.type.name
            sub = e.type.sub_type
            while sub is not None:
                name, sub = f"{name}.{sub.name}", sub.sub_type
            if e.qualifier:  # a qualified class literal, `org.example.Foo.class`
                name = f"{e.qualifier}.{name}"
            return self.index.resolve(name, self.cls) or name
        v = self._value(e, None)
        return f"<{v[1]}>"

    def _cache_file(self, e, line: int) -> CacheFile:
        """`new URI(p)`, `URI.create(p)`, `new Path(p).toUri()`, with an optional `+ "#link"`."""
        link = None
        if isinstance(e, T.ClassCreator) and e.type.name == "URI" and len(e.arguments or []) == 1 and not e.selectors:
            e = e.arguments[0]
        elif (isinstance(e, T.MethodInvocation) and (e.qualifier, e.member) == ("URI", "create")
              and len(e.arguments or []) == 1 and not e.selectors):
            e = e.arguments[0]
        elif (isinstance(e, T.ClassCreator) and e.type.name == "Path" and len(e.arguments or []) == 1
              and [getattr(s, "member", None) for s in e.selectors or []] == ["toUri"]):
            e = e.arguments[0]
        else:
            return CacheFile(PathRef("unknown", text="a computed URI"), line)
        if isinstance(e, T.BinaryOperation) and e.operator == "+":
            frag = self._value(e.operandr, None)
            if frag[0] == "str" and frag[1].startswith("#"):
                e, link = e.operandl, frag[1][1:]
        v = self._value(e, None)
        if v[0] == "str" and "#" in v[1]:
            path, link = v[1].split("#", 1)
            return CacheFile(PathRef("literal", literal=path), line, link)
        return CacheFile(self._path_ref(v, e), line, link)

    def _path_ref(self, v: tuple, node) -> PathRef:
        if v[0] == "path":
            return v[1]
        if v[0] == "computed":
            return PathRef("computed", text=v[1], parts=v[2] if len(v) > 2 else None)
        if v[0] == "arg":
            return PathRef("arg", index=v[1])
        if v[0] == "arg_end":
            return PathRef("arg", from_end=v[1])
        if v[0] == "arg_run":
            return PathRef("args", index=v[1], from_end=v[2])
        if v[0] == "str":
            return PathRef("literal", literal=v[1])
        return PathRef("unknown", text=str(v[1]))


# Calls that make a branch of the driver part of configuring or running a job.
_CONFIGURING = {*_JOB_CALLS, *_TYPE_CALLS, *_CONF_SETTERS, "setNumReduceTasks", "setInputFormatClass",
                "setOutputFormatClass", "setInputFormat", "setOutputFormat", "addInputPath", "setInputPaths",
                "setOutputPath", "waitForCompletion", "submit", "runJob"}


_SUBMITS = {"waitForCompletion", "submit", "runJob", "isSuccessful"}
# Calls that change what a job computes or where it reads and writes (not its name or jar).
_JOB_SETTINGS = _CONFIGURING - _SUBMITS


def _sets_job(node) -> bool:
    """Whether a statement changes a job's classes, types, formats, paths, reduce count or settings."""
    return any(isinstance(n, T.MethodInvocation) and n.member in _JOB_SETTINGS for _, n in node)


def _text(e) -> str:
    """A short Java-like text of an expression, for a message."""
    if isinstance(e, T.MemberReference):
        return ".".join(p for p in (e.qualifier, e.member) if p) + "".join(
            "[…]" if isinstance(x, T.ArraySelector) else f".{getattr(x, 'member', '…')}(…)" for x in e.selectors or [])
    if isinstance(e, T.BinaryOperation):
        return f"{_text(e.operandl)} {e.operator} {_text(e.operandr)}"
    if isinstance(e, T.MethodInvocation):
        return ".".join(p for p in (e.qualifier, e.member) if p) + "(…)"
    if isinstance(e, T.Literal):
        return e.value
    return "…"


def _configures(node) -> bool:
    """Whether a statement configures, creates or runs a job anywhere inside it."""
    for _, n in node:
        if isinstance(n, T.MethodInvocation) and n.member in _CONFIGURING or \
                isinstance(n, T.ClassCreator) and n.type.name in ("Job", "JobConf"):
            return True
    return False


def _empty_conf(e) -> bool:
    """`null`, `new Configuration(false)`, `new JobConf(false)`: the link adds no settings of its own."""
    if isinstance(e, T.Literal) and e.value == "null":
        return True
    return isinstance(e, T.ClassCreator) and e.type.name in ("Configuration", "JobConf") and \
        [getattr(a, "value", None) for a in e.arguments or []] == ["false"]


def _job_creations(where) -> list[int]:
    """Lines of every `Job.getInstance(...)`, `new Job(...)` and `new JobConf(...)` in the driver class
    (or a statement of it); `new JobConf(false)`, a chain link's own empty settings, is not a job."""
    lines = []
    cls = where if isinstance(where, ClassInfo) else None
    for _, node in (where.node if cls is not None else where):
        if isinstance(node, T.MethodInvocation) and node.member == "getInstance" and \
                (node.qualifier or "").split(".")[-1] == "Job" or \
                isinstance(node, T.ClassCreator) and node.type.name in ("Job", "JobConf") and not _empty_conf(node):
            lines.append(_line(node) or (cls.line_start if cls is not None else 0))
    return sorted(lines)


_USAGE_CALLS = {"println", "print", "printf", "format", "printGenericCommandUsage", "printUsage", "usage", "exit"}


def _exits(stmt) -> bool:
    """An `if` branch that only prints usage and exits or returns (argument checks). A branch that
    also does work (configures and runs a second job, then returns) is walked like any other."""
    stmts = stmt.statements if isinstance(stmt, T.BlockStatement) else [stmt]
    leaves = False
    for s in stmts or []:
        if isinstance(s, T.ReturnStatement) or isinstance(s, T.ThrowStatement):
            leaves = True
        elif isinstance(s, T.StatementExpression) and isinstance(s.expression, T.MethodInvocation) \
                and s.expression.member in _USAGE_CALLS:
            leaves = leaves or s.expression.member == "exit"
        else:
            return False
    return leaves


def _category_of(name: str) -> str:
    simple = name.split(".")[-1]
    return {"MultipleInputs": "multiple-inputs", "MultipleOutputs": "named-outputs", "DistributedCache": "side-files",
            "ChainMapper": "chained-maps", "ChainReducer": "chained-maps", "JobControl": "chained-jobs"}.get(simple, "driver")


def _line(node) -> int:
    return node_lines(node)[0]


def _conf_text(v: tuple) -> str:
    """A `conf.set` value as the job reads it, or `<what it is>` when the driver computes it at run time."""
    if v[0] in ("str", "int", "lit"):
        return str(v[1])
    return f"<args[{v[1]}]>" if v[0] == "arg" else f"<{v[1]}>"
