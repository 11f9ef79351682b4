import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Paths;
import java.text.SimpleDateFormat;
import java.util.Calendar;
import java.util.Date;
import java.util.TimeZone;

/** SimpleDateFormat(pattern).parse(s) in a default zone: prints getTime(), HOUR_OF_DAY, DAY_OF_WEEK, or THROWS.
 *  With a fourth argument other than "-" the format has that zone of its own (setTimeZone) and the line ends
 *  with format(d); a fifth argument "strict" makes the format not lenient (setLenient(false)). */
public class DateParse {
    public static void main(String[] args) throws Exception {
        TimeZone.setDefault(TimeZone.getTimeZone(args[0]));
        SimpleDateFormat fmt = new SimpleDateFormat(args[1]);
        boolean ownZone = args.length > 3 && !args[3].equals("-");
        if (ownZone) fmt.setTimeZone(TimeZone.getTimeZone(args[3]));
        if (args.length > 4 && args[4].equals("strict")) fmt.setLenient(false);
        Calendar cal = Calendar.getInstance();
        for (String line : Files.readAllLines(Paths.get(args[2]), StandardCharsets.UTF_8)) {
            try {
                Date d = fmt.parse(line);
                cal.setTime(d);
                System.out.println(d.getTime() + " " + cal.get(Calendar.HOUR_OF_DAY) + " " + cal.get(Calendar.DAY_OF_WEEK)
                                   + (ownZone ? " " + fmt.format(d) : ""));
            } catch (java.text.ParseException e) {
                System.out.println("THROWS");
            }
        }
    }
}
