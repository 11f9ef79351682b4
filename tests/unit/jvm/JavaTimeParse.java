import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Paths;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.time.format.DateTimeFormatter;

/** LocalDateTime/LocalDate.parse(s, ofPattern(p)): prints fields and format(p), or THROWS. */
public class JavaTimeParse {
    public static void main(String[] args) throws Exception {
        DateTimeFormatter fmt = DateTimeFormatter.ofPattern(args[1]);
        for (String line : Files.readAllLines(Paths.get(args[2]), StandardCharsets.UTF_8)) {
            try {
                if (args[0].equals("datetime")) {
                    LocalDateTime t = LocalDateTime.parse(line, fmt);
                    System.out.println(t.getYear() + " " + t.getMonthValue() + " " + t.getDayOfMonth() + " " + t.getHour()
                            + " " + t.getMinute() + " " + t.getSecond() + " " + t.getDayOfWeek().getValue() + " " + t.format(fmt));
                } else {
                    LocalDate d = LocalDate.parse(line, fmt);
                    System.out.println(d.getYear() + " " + d.getMonthValue() + " " + d.getDayOfMonth() + " 0 0 0 "
                            + d.getDayOfWeek().getValue() + " " + d.format(fmt));
                }
            } catch (RuntimeException e) {
                System.out.println("THROWS");
            }
        }
    }
}
