import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Paths;
import java.text.SimpleDateFormat;
import java.util.Calendar;
import java.util.Date;
import java.util.TimeZone;

/** SimpleDateFormat(pattern).parse(s) in a zone: prints getTime(), HOUR_OF_DAY, DAY_OF_WEEK, or THROWS. */
public class DateParse {
    public static void main(String[] args) throws Exception {
        TimeZone.setDefault(TimeZone.getTimeZone(args[0]));
        SimpleDateFormat fmt = new SimpleDateFormat(args[1]);
        Calendar cal = Calendar.getInstance();
        for (String line : Files.readAllLines(Paths.get(args[2]), StandardCharsets.UTF_8)) {
            try {
                Date d = fmt.parse(line);
                cal.setTime(d);
                System.out.println(d.getTime() + " " + cal.get(Calendar.HOUR_OF_DAY) + " " + cal.get(Calendar.DAY_OF_WEEK));
            } catch (java.text.ParseException e) {
                System.out.println("THROWS");
            }
        }
    }
}
