"""The lowered spellings against the real thing: each job is converted, then `mrlift verify`
runs the original on Hadoop's local runner and the script on local Spark over the same input
(with the traps: empty lines, non-ASCII, short lines, a bad number) and their outputs must agree."""
from __future__ import annotations

import pytest

from tests.helpers import job_source, scan_text, verify_one_job

pytestmark = pytest.mark.parity

INPUT = "ab c\n\nÄö😀 x\nq\n7 8 9\nzz,1\n  lead  trail \nbad x1\n"

CASES = {
    # Text.hashCode() is hashBytes over the UTF-8 bytes (org.apache.hadoop.io.Text), not String.hashCode
    "text_hash_codes": ("""
      Text trimmed = new Text(value.toString().trim());
      context.write(new Text("line " + value.hashCode()), new IntWritable(trimmed.hashCode()));
      context.write(new Text("string " + value.toString().hashCode()), new IntWritable(value.getLength()));""", ""),
    # Text.equals is true only for another Text: against a String literal it is never true (Text javadoc)
    "text_equals": ("""
      Text q = new Text("q");
      if (value.equals("q")) context.write(new Text("never"), new IntWritable(1));
      if (value.equals(q)) context.write(new Text("text q"), new IntWritable(2));
      if (value.toString().equals("q")) context.write(new Text("string q"), new IntWritable(3));""", ""),
    "chars_of_a_word": ("""
      String[] words = value.toString().split(" ");
      for (int i = 0; i < words.length; i++) {
        String w = words[i];
        for (int j = 0; j < w.length(); j++) {
          char c = w.charAt(j);
          context.write(new Text(String.valueOf(c)), new IntWritable(1));
        }
      }""", "", INPUT.replace("😀", "ß")),  # a char beyond U+FFFF fails the script (java_chars)
    "tokens_one_by_one": ("""
      StringTokenizer itr = new StringTokenizer(value.toString());
      if (itr.hasMoreTokens()) {
        String first = itr.nextToken();
        if (itr.hasMoreTokens()) {
          itr.nextToken();
          int left = itr.countTokens();
          String third = itr.hasMoreTokens() ? itr.nextToken() : "-";
          context.write(new Text(first + "|" + third), new IntWritable(left));
        }
      }""", ""),
    "scratch_field_and_logged_catch": ("""
      parts = value.toString().split(" ");
      try {
        context.write(new Text(parts[0]), new IntWritable(Integer.parseInt(parts[1])));
      } catch (NumberFormatException | ArrayIndexOutOfBoundsException e) {
        e.printStackTrace();
        System.err.println("skipped: " + e.getMessage());
      }""", "private String[] parts;"),
    "helper_with_a_default": ("""
      String first = value.toString().split(" ")[0];
      context.write(new Text(first.isEmpty() ? "empty" : "n"), new IntWritable(toInt(first)));""", """
    static int toInt(String s) {
      try {
        return Integer.parseInt(s) * 10;
      } catch (NumberFormatException e) {
        e.printStackTrace();
        return -1;
      }
    }"""),
    "this_var_and_locale": ("""
      var line = value.toString();
      this.word.set(line.trim().toUpperCase(java.util.Locale.ROOT));
      if (!java.util.Objects.equals(line, "")) { context.write(this.word, new IntWritable(1)); }""",
                            "private Text word = new Text();"),
    "builder_and_while_loop": ("""
      String[] words = value.toString().split(" ");
      int at = 0;
      while (at < words.length) {
        String w = words[at];
        at++;
        if (w.isEmpty()) continue;
        StringBuilder sb = new StringBuilder(w.trim());
        sb.append('#').append(w.length()).append(w.charAt(0) > 'm');
        context.write(new Text(sb.toString()), new IntWritable(sb.length()));
      }""", ""),
    "catch_gives_a_default": ("""
      String[] f = value.toString().split(" ");
      int n = -1;
      try {
        n = Integer.parseInt(f[1].trim());
      } catch (NumberFormatException | ArrayIndexOutOfBoundsException e) {
        context.getCounter("quality", "bad number").increment(1);
      }
      double w;
      try {
        w = Double.parseDouble(f[f.length - 1]);
      } catch (Exception e) {
        System.err.println("no weight");
        w = 0.5;
      }
      context.write(new Text(f[0] + ":" + w), new IntWritable(n));""", ""),
}


SUM_REDUCER = """
  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text k, Iterable<IntWritable> vs, Context c) throws IOException, InterruptedException {
      int s = 0;
      for (IntWritable v : vs) { s += v.get(); }
      c.write(k, new IntWritable(s));
    }
  }"""


def _agrees_with_hadoop(tmp_path, source: str, data: dict[str, bytes], driver: str = "Main",
                        more: dict[str, str] | None = None) -> None:
    """Convert the one-job repository, then `mrlift verify` it: Hadoop and the script on `data`."""
    check = verify_one_job(tmp_path, source, data, driver, more)
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


@pytest.mark.parametrize("case", sorted(CASES))
def test_lowered_job_agrees_with_hadoop(case, tmp_path):
    body, fields, *given = CASES[case]
    _agrees_with_hadoop(tmp_path, job_source(body, reducer=SUM_REDUCER, fields=fields),
                        {"lines.txt": (given[0] if given else INPUT).encode("utf-8")})


def test_chars_are_utf16_units_and_fail_loudly_beyond_the_bmp(spark):
    """String.toCharArray() (Java SE API: one char per UTF-16 code unit): "Äß" gives two chars, ""
    none; a character beyond U+FFFF would give two halves no Spark string can hold, so the script
    fails there instead of writing something else."""
    from pyspark.sql import Column, DataFrame, Window
    from pyspark.sql import functions as F

    from migrate.gen.helpers import helper_source

    ns = {"F": F, "Column": Column, "DataFrame": DataFrame, "Window": Window}
    exec(helper_source({"java_chars"}), ns)
    rows = spark.createDataFrame([("Äß",), ("",), ("a b",)], "s string").select(ns["java_chars"](F.col("s"))).collect()
    assert [r[0] for r in rows] == [["Ä", "ß"], [], ["a", " ", "b"]]
    with pytest.raises(Exception, match="beyond U\\+FFFF"):
        spark.createDataFrame([("a😀",)], "s string").select(ns["java_chars"](F.col("s"))).collect()


KEY = """
  public static class Pair implements WritableComparable<Pair> {
    private String a = "";
    private String b = "";
    public Pair() { }
    public Pair(String a, String b) { this(new Text(a), new Text(b)); }
    public Pair(Text a, Text b) { this.a = a.toString(); this.b = b.toString(); }
    public Pair(int a, int b) { this.a = "#" + a; this.b = "#" + b; }
    public void set(String a, String b) { this.a = a; this.b = b; }
    public void write(java.io.DataOutput out) throws IOException { out.writeUTF(a); out.writeUTF(b); }
    public void readFields(java.io.DataInput in) throws IOException { a = in.readUTF(); b = in.readUTF(); }
    public int compareTo(Pair o) { int c = a.compareTo(o.a); if (c != 0) { return c; } return b.compareTo(o.b); }
    public int hashCode() { return a.hashCode() * 31 + b.hashCode(); }
    public String toString() { return a + "/" + b; }
  }
"""


def test_key_objects_by_overload_and_guarded_setters_agree_with_hadoop(tmp_path):
    body = """
      String[] f = value.toString().split(" ");
      context.write(new Pair(f[0], "s"), new IntWritable(1));
      context.write(new Pair(f.length, f[0].length()), new IntWritable(2));
      if (f.length > 1) {
        pair.set(f[1], f[0]);
        context.write(pair, new IntWritable(3));
      }"""
    source = job_source(body, fields="private final Pair pair = new Pair();", map_out=("Pair", "IntWritable"),
                        out=("Pair", "IntWritable"), reducer_class=None, extra_driver="job.setNumReduceTasks(0);")
    _agrees_with_hadoop(tmp_path, source.replace("public class Main {", "public class Main {\n" + KEY),
                        {"lines.txt": INPUT.encode("utf-8")})


OFFSET_INPUT = "\ufeffalpha,1\r\nbeta,2\rgamma,3\n\nÄö,4\nlast,no newline"


@pytest.mark.parametrize("body, reducer", [
    ('      context.write(new Text(key.get() + "@" + value), new IntWritable(value.getLength()));', None),
    ("      if (key.get() > 0) { context.write(new Text(value.toString()), new IntWritable((int) key.get())); }", "R"),
], ids=["offset_in_the_key_map_only", "offset_as_a_value"])
def test_byte_offsets_agree_with_hadoop(body, reducer, tmp_path):
    """TextInputFormat's key (LineRecordReader): the byte offset of each line, over CRLF, CR and LF line
    ends, an empty line, a UTF-8 byte order mark, two-byte characters and a last line without an end."""
    source = job_source(body, reducer=SUM_REDUCER if reducer else "", reducer_class=reducer,
                        extra_driver="" if reducer else "job.setNumReduceTasks(0);")
    _agrees_with_hadoop(tmp_path, source, {"a.txt": OFFSET_INPUT.encode("utf-8"), "b.txt": b"one\ntwo\n"})


def test_constant_collections_agree_with_hadoop(tmp_path):
    body = """
      for (String w : value.toString().split(" ")) {
        if (STOP.contains(w.toLowerCase()) || MORE.contains(w)) continue;
        context.write(new Text(w + (KEEP.contains(w) ? "!" : "") + KEEP.size()), new IntWritable(MORE.size()));
      }"""
    fields = """private static final Set<String> STOP = new HashSet<>(Arrays.asList("ab", "q", ""));
    private static final Set<String> MORE = new TreeSet<>();
    static { MORE.add("7"); java.util.Collections.addAll(MORE, "zz,1", "7"); }
    private static final List<String> KEEP = Arrays.asList("8", "9", "8");"""
    _agrees_with_hadoop(tmp_path, job_source(body, fields=fields, reducer_class=None,
                                             extra_driver="job.setNumReduceTasks(0);"),
                        {"lines.txt": INPUT.encode("utf-8")})


def test_narrowing_compound_assignments_agree_with_hadoop(tmp_path):
    """JLS 15.26.2: `x op= v` is `x = (T) (x op v)`. An int sum of longs keeps the low 32 bits at every
    step (here past 2^31, with the reducer as its own combiner); `int *= double` truncates toward zero."""
    body = """
      String[] f = value.toString().split(" ");
      try {
        int scaled = 3;
        scaled *= Double.parseDouble(f[1]);
        int low = 1;
        low += Long.parseLong(f[1]) * 1000L;
        context.write(new Text(f[0] + ":" + scaled + ":" + low), new LongWritable(Long.parseLong(f[1])));
      } catch (NumberFormatException | ArrayIndexOutOfBoundsException e) { }"""
    reducer = """
  public static class R extends Reducer<Text, LongWritable, Text, LongWritable> {
    private LongWritable result = new LongWritable();
    protected void reduce(Text k, Iterable<LongWritable> vs, Context c) throws IOException, InterruptedException {
      int sum = 0;
      for (LongWritable v : vs) sum += v.get();
      result.set(sum);
      c.write(k, result);
    }
  }"""
    source = job_source(body, reducer=reducer, map_out=("Text", "LongWritable"), out=("Text", "LongWritable"),
                        extra_driver="job.setCombinerClass(R.class);")
    lines = "a 2147483647\na 2147483647\nb -3000000000\nb 7\nc 2.5\nd x\ne 1e10\n"
    _agrees_with_hadoop(tmp_path, source, {"lines.txt": lines.encode("utf-8")})


def test_java_traps_agree_with_hadoop(tmp_path):
    """The golden job with three of Java's traps (integer division widened to a double, char
    arithmetic, an int total of longs past 2^31 with the reducer as combiner), run on both engines."""
    from pathlib import Path

    (java,) = (Path(__file__).parents[1] / "golden" / "cases" / "latent_bugs" / "java_traps").glob("*.java")
    lines = ("S12,B,5400000,3\nS12,B,2147483647000,1\nS12,B,2147483647000,1\nS7,A,999,2\nS7,Ä,10,1\n"
             "S9,C,x,1\nS9,,5,1\nS9,C,7000,0\nshort,line\n")
    _agrees_with_hadoop(tmp_path, java.read_text(encoding="utf-8").replace("package net.brindleharbour.ferry;", ""),
                        {"loads.csv": lines.encode("utf-8")}, driver=java.stem)


REGEX_INPUT = ("10.0.0.1 [03/Dec] \"GET /a\" 200\n10.0.0.2 [x] \"POST /b\"\nnot a log line\n"
               "#Tide and #tide, #Ebb!\n\nid=42;x id=7\nID=9 #äb\n")


@pytest.mark.parametrize("body, fields", [
    ("""
      Matcher m = LOG.matcher(value.toString());
      if (!m.matches()) {
        return;
      }
      context.write(new Text(m.group(1) + "|" + m.group(3)), new IntWritable(m.group(2).length()));""",
     """private static final Pattern LOG = Pattern.compile("(\\\\S+) \\\\[([^\\\\]]*)\\\\] \\"(GET|POST) [^\\"]*\\"( \\\\d+)?");"""),
    ("""
      Matcher m = tag.matcher(value.toString());
      while (m.find()) {
        context.write(new Text(m.group(1).toLowerCase()), new IntWritable(1));
      }""", """private Pattern tag;
    protected void setup(Context context) { tag = Pattern.compile("#(\\\\w+)", Pattern.CASE_INSENSITIVE); }"""),
    ("""
      String line = value.toString();
      Matcher m = Pattern.compile("id=(\\\\d+)(;x)?").matcher(line);
      String id = "none";
      if (m.find()) {
        id = m.group(1);
      }
      boolean caps = Pattern.matches("[A-Z].*", line);
      context.write(new Text(id + "/" + caps + "/" + ID.matcher(line).lookingAt() + "/" + ID.split(line).length),
                    new IntWritable(m.groupCount()));""",
     """private static final Pattern ID = Pattern.compile("id=", Pattern.CASE_INSENSITIVE);"""),
], ids=["matches_then_groups", "find_loop_in_setup_pattern", "find_once_with_default"])
def test_regex_matchers_agree_with_hadoop(body, fields, tmp_path):
    """java.util.regex on both sides (Spark's rlike and regexp_extract are java.util.regex): matches()
    with groups after an early return, a find() loop over a pattern made in setup(), find() once with
    a default, Pattern.matches, lookingAt and Pattern.split."""
    source = job_source(body, fields=fields, reducer=SUM_REDUCER).replace("import java.util.*;",
                                                                          "import java.util.*;\nimport java.util.regex.*;")
    _agrees_with_hadoop(tmp_path, source, {"log.txt": REGEX_INPUT.encode("utf-8")})


LINE_UTIL = """
public final class LineUtil {
  static final String SEP = ",";
  private LineUtil() { }
  static String field(String line, int i) {
    String[] f = line.split(SEP);
    return i < f.length ? f[i].trim() : "";
  }
  static int number(String s) {
    try {
      return Integer.parseInt(s);
    } catch (NumberFormatException e) {
      return 0;
    }
  }
}
"""


def test_static_helpers_of_another_class_agree_with_hadoop(tmp_path):
    """Helpers in a utility class of the repository are inlined with that class's constants; a
    local of map() named like the utility's constant does not leak into the helper."""
    body = """
      String SEP = "|";
      String line = value.toString();
      context.write(new Text(LineUtil.field(line, 0) + SEP), new IntWritable(LineUtil.number(LineUtil.field(line, 1))));"""
    _agrees_with_hadoop(tmp_path, job_source(body, reducer=SUM_REDUCER),
                        {"lines.csv": "a,1\nb, 2\na,x\n,\nc\n".encode("utf-8")}, more={"LineUtil.java": LINE_UTIL})


def test_constant_maps_and_int_sets_agree_with_hadoop(tmp_path):
    """Maps of literals (Map.of, put() in a static block and in setup(): the last put wins) read by
    get with a null test, getOrDefault, containsKey and size; a set of ints read by contains."""
    body = """
      String[] f = value.toString().split(" ");
      String kind = KINDS.get(f[0]);
      if (kind == null) {
        kind = "other";
      }
      int n = -1;
      try { n = Integer.parseInt(f[f.length - 1]); } catch (NumberFormatException e) { }
      context.write(new Text(kind + "/" + CODES.getOrDefault(f[0], "?") + "/" + SMALL.contains(n) + CODES.containsKey(f[0])),
                    new IntWritable(WEIGHTS.getOrDefault(f[0], 0) + KINDS.size()));"""
    fields = """private static final Map<String, String> KINDS = Map.of("ab", "letters", "7", "digit", "q", "letter");
    private static final Map<String, Integer> WEIGHTS = new HashMap<>();
    static { WEIGHTS.put("ab", 4); WEIGHTS.put("q", 2); WEIGHTS.put("ab", 5); }
    private final Map<String, String> CODES = new TreeMap<>();
    private static final Set<Integer> SMALL = new HashSet<>(Arrays.asList(7, 8, 9, 1));
    protected void setup(Context context) { CODES.put("zz,1", "z"); CODES.put("7", "seven"); }"""
    _agrees_with_hadoop(tmp_path, job_source(body, fields=fields, reducer=SUM_REDUCER),
                        {"lines.txt": INPUT.encode("utf-8")})


def test_counters_named_by_the_data_agree_with_hadoop(tmp_path):
    """A counter per value (`getCounter("Status", f[1])`, a computed group too): the script's
    counter report must equal the job log's, names over 64 chars cut to 63 as Hadoop's Limits
    does (two long names equal in their first 63 chars become one counter), the counter in a
    catch block counting the records that threw. `verify` compares the job's counters."""
    body = """
      String[] f = value.toString().split(",");
      if (f.length < 2) { context.getCounter("Quality", "short").increment(1); return; }
      context.getCounter("Status", f[1].trim()).increment(1);
      context.getCounter("By " + f[0], "rows").increment(f[0].length());
      int n = -1;
      try {
        n = Integer.parseInt(f[2]);
      } catch (NumberFormatException | ArrayIndexOutOfBoundsException e) {
        context.getCounter("Bad", f[1] + "#" + (f.length > 2 ? f[2] : "none")).increment(1);
      }
      context.write(new Text(f[1]), new IntWritable(n));"""
    long = "waiting-for-the-ferry-" * 3  # 66 chars: two statuses that differ only after char 63
    data = (f"a,ok,1\nb,ok,2\na, late ,x\nc,Ärger,3\nd,{long}X,4\nd,{long}Y,5\nshort\n,ok,6\na,ok\n")
    _agrees_with_hadoop(tmp_path, job_source(body, reducer=SUM_REDUCER), {"lines.txt": data.encode("utf-8")})


def test_hadoop_string_utils_split_agrees_with_hadoop(tmp_path):
    """org.apache.hadoop.util.StringUtils.split: escaped separators stay in the field, trailing
    empty fields go, "" has no field; split(s, char) is String.split of that char."""
    body = """
      String line = value.toString();
      String[] f = StringUtils.split(line);
      String[] g = StringUtils.split(line, '|');
      String[] h = StringUtils.split(line, StringUtils.ESCAPE_CHAR, '|');
      context.write(new Text(f.length + ":" + String.join("/", f)), new IntWritable(g.length * 10 + h.length));"""
    source = job_source(body, reducer=SUM_REDUCER).replace(
        "import java.util.*;", "import java.util.*;\nimport org.apache.hadoop.util.StringUtils;")
    data = "a,b\n\n,,\na\\,b,c|d\\|e\nx\\\\,y,,\nend\\\n|a||\n"
    _agrees_with_hadoop(tmp_path, source, {"lines.txt": data.encode("utf-8")})


def test_iterator_loops_over_the_values_agree_with_hadoop(tmp_path):
    """`while (it.hasNext())` and `for (; it.hasNext(); )` over values.iterator(), next() read in an
    expression, into a local, or only to move on, against the real reduce-side iterator."""
    reducer = """
  public static class R extends Reducer<Text, IntWritable, Text, Text> {
    protected void reduce(Text k, Iterable<IntWritable> vs, Context c) throws IOException, InterruptedException {
      long total = 0;
      int n = 0;
      Iterator<IntWritable> it = vs.iterator();
      while (it.hasNext()) {
        n++;
        total += it.next().get();
      }
      c.write(k, new Text(total + "/" + n));
    }
  }"""
    body = """
      String[] f = value.toString().split(" ");
      if (f.length > 1 && !f[1].isEmpty() && Character.isDigit(f[1].charAt(0))) {
        context.write(new Text(f[0]), new IntWritable(Integer.parseInt(f[1])));
      }"""
    data = "a 1\nb 2\na 3\nc 9\nb 5\na 11\nx y\n"
    source = job_source(body, reducer=reducer, out=("Text", "Text"))
    _agrees_with_hadoop(tmp_path, source, {"lines.txt": data.encode("utf-8")})


def test_a_date_format_configured_in_setup_agrees_with_hadoop(tmp_path):
    """A SimpleDateFormat made in setup() with setTimeZone and setLenient(false), and a local one
    configured right after it is made: parsed and formatted in the zone set on them while the
    JVM runs in UTC (the DST gap of 2024-03-10 in New York included)."""
    body = """
      String[] f = value.toString().split(",");
      try {
        Date when = stamp.parse(f[0]);
        SimpleDateFormat day = new SimpleDateFormat("yyyy-MM-dd HH");
        day.setTimeZone(TimeZone.getTimeZone("America/New_York"));
        context.write(new Text(day.format(when) + "|" + when.getTime()), new IntWritable(f.length));
      } catch (java.text.ParseException e) {
        context.getCounter("dates", "unparseable").increment(1);
      }"""
    fields = """private SimpleDateFormat stamp;
    protected void setup(Context context) {
      stamp = new SimpleDateFormat("yyyy-MM-dd HH:mm:ss");
      stamp.setTimeZone(TimeZone.getTimeZone("America/New_York"));
      stamp.setLenient(false);
    }"""
    data = ("2024-03-10 02:30:00,a\n2024-03-10 03:30:00,b\n2024-11-03 01:30:00,c\n2024-02-30 10:00:00,d\n"
            "2024-07-01 23:59:59,e\nnot a date,f\n2024-12-31 19:00:00,g\n")
    source = job_source(body, fields=fields, reducer=SUM_REDUCER).replace("import java.util.*;",
                                                                          "import java.util.*;\nimport java.text.*;")
    _agrees_with_hadoop(tmp_path, source, {"lines.txt": data.encode("utf-8")})


def test_break_in_a_loop_agrees_with_hadoop(tmp_path):
    """`break` ends the loop: the elements after the first one that breaks are not visited, and the
    statements after the break in that iteration do not run (a write before it does)."""
    body = """
      String[] words = value.toString().split(" ");
      for (String w : words) {
        String t = w.trim();
        if (t.equals("--")) {
          break;
        }
        context.write(new Text("w:" + t), new IntWritable(1));
        if (t.endsWith(".")) break;
        context.getCounter("words", "after the stop check").increment(1);
      }"""
    data = "a b -- c d\nend. of line\n-- x\nno stop here\n\nq r. s -- t\n"
    _agrees_with_hadoop(tmp_path, job_source(body, reducer=SUM_REDUCER), {"lines.txt": data.encode("utf-8")})


def test_break_in_a_token_loop_after_a_continue_agrees_with_hadoop(tmp_path):
    """A StringTokenizer loop whose `continue` skips some tokens before the `break` test: a skipped
    token never breaks the loop; a token that would throw after the break point is never parsed."""
    body = """
      StringTokenizer itr = new StringTokenizer(value.toString());
      while (itr.hasMoreTokens()) {
        String tok = itr.nextToken();
        if (tok.startsWith("#")) continue;
        if (tok.equals("stop")) break;
        context.write(new Text(tok), new IntWritable(Integer.parseInt(tok.substring(0, 1)) ));
      }"""
    data = "1a 2b stop x9\n#stop 3c stop\nstop 4d\n5e 6f\n"
    _agrees_with_hadoop(tmp_path, job_source(body, reducer=SUM_REDUCER), {"lines.txt": data.encode("utf-8")})


def test_return_in_a_loop_agrees_with_hadoop(tmp_path):
    """`return` in the only loop of map(), with nothing after the loop: the loop's last pass."""
    body = """
      String[] cells = value.toString().split(",");
      for (String c : cells) {
        if (c.trim().isEmpty()) {
          context.getCounter("cells", "blank").increment(1);
          return;
        }
        context.write(new Text(c.trim()), new IntWritable(c.length()));
      }"""
    data = "a,b,,c\n,x\nd, e ,f\n\n g,h,  ,i\n"
    _agrees_with_hadoop(tmp_path, job_source(body, reducer=SUM_REDUCER), {"lines.txt": data.encode("utf-8")})
