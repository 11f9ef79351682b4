import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Paths;
import java.util.ArrayList;
import java.util.List;
import java.util.StringTokenizer;

/** Evaluates the Java idioms mrlift relies on over hex-encoded inputs; prints op, index, hex(result). */
public class Semantics {
    static String hex(String s) {
        StringBuilder b = new StringBuilder();
        for (byte x : s.getBytes(StandardCharsets.UTF_8)) b.append(String.format("%02X", x));
        return b.toString();
    }

    static String unhex(String h) {
        byte[] out = new byte[h.length() / 2];
        for (int i = 0; i < out.length; i++) out[i] = (byte) Integer.parseInt(h.substring(2 * i, 2 * i + 2), 16);
        return new String(out, StandardCharsets.UTF_8);
    }

    static void emit(String op, int i, String result) {
        System.out.println(op + "\t" + i + "\t" + hex(result));
    }

    public static void main(String[] args) throws Exception {
        List<String> inputs = new ArrayList<>();
        for (String line : Files.readAllLines(Paths.get(args[0]))) inputs.add(line.isEmpty() ? "" : unhex(line));
        for (int i = 0; i < inputs.size(); i++) {
            String s = inputs.get(i);
            emit("split_comma", i, String.join("|", s.split(",")) + "#" + s.split(",").length);
            emit("split_pipe_escaped", i, String.join("|", s.split("\\|")) + "#" + s.split("\\|").length);
            emit("split_comma_limit", i, String.join("|", s.split(",", -1)) + "#" + s.split(",", -1).length);
            StringTokenizer t = new StringTokenizer(s);
            List<String> toks = new ArrayList<>();
            while (t.hasMoreTokens()) toks.add(t.nextToken());
            emit("tokens", i, String.join("|", toks) + "#" + toks.size());
            StringTokenizer t2 = new StringTokenizer(s, ",;");
            List<String> toks2 = new ArrayList<>();
            while (t2.hasMoreTokens()) toks2.add(t2.nextToken());
            emit("tokens_delims", i, String.join("|", toks2) + "#" + toks2.size());
            emit("trim", i, s.trim());
            emit("lower", i, s.toLowerCase());
            emit("length", i, String.valueOf(s.length()));
            try { emit("parse_int", i, String.valueOf(Integer.parseInt(s))); } catch (NumberFormatException e) { emit("parse_int", i, "THROWS"); }
            try { emit("parse_long", i, String.valueOf(Long.parseLong(s))); } catch (NumberFormatException e) { emit("parse_long", i, "THROWS"); }
            try { emit("parse_double", i, String.valueOf(Double.parseDouble(s))); } catch (NumberFormatException e) { emit("parse_double", i, "THROWS"); }
        }
        long[][] pairs = {{-7, 2}, {7, -2}, {7, 2}, {-7, -2}, {0, 5}, {Long.MAX_VALUE, 3}, {-9, 4}};
        for (int i = 0; i < pairs.length; i++) {
            emit("long_div", i, String.valueOf(pairs[i][0] / pairs[i][1]));
            emit("long_mod", i, String.valueOf(pairs[i][0] % pairs[i][1]));
        }
        int[][] sums = {{2147483647, 1}, {-2147483648, -1}, {100000, 100000}};
        for (int i = 0; i < sums.length; i++) emit("int_wrap_sum", i, String.valueOf(sums[i][0] + sums[i][1]));
        double[][] divs = {{7.0, 0.0}, {-7.0, 0.0}, {0.0, 0.0}, {7.0, -0.0}, {1.0, 3.0}};
        for (int i = 0; i < divs.length; i++) emit("double_div", i, String.valueOf(divs[i][0] / divs[i][1]));
    }
}
