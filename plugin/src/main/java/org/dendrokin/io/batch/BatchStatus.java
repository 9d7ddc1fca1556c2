package org.dendrokin.io.batch;

import java.util.Locale;

/**
 * Where a running batch stands, for a progress line.
 *
 * @param total    sessions in this run (this shard's share when sharded)
 * @param done     sessions finished, whatever the outcome
 * @param analysed sessions analysed in this run (succeeded or failed)
 * @param skipped  sessions whose earlier result was still current
 * @param failed   sessions whose result is a failure (analysed now or earlier)
 * @param elapsedS wall time since the run started, s
 */
public record BatchStatus(int total, int done, int analysed, int skipped, int failed, double elapsedS) {

    /** Sessions analysed per second of wall time (skipped ones are not counted); 0 before the first one. */
    public double ratePerS() {
        return analysed > 0 && elapsedS > 0 ? analysed / elapsedS : 0;
    }

    /** Estimated seconds until every session is finished, assuming the rest is analysed at the same rate. */
    public double remainingS() {
        double rate = ratePerS();
        return rate > 0 ? (total - done) / rate : Double.NaN;
    }

    /** One line such as {@code 12/40 sessions done (2 failed, 5 skipped), 0.8/s, about 35 s left}. */
    public String line() {
        StringBuilder s = new StringBuilder();
        s.append(done).append('/').append(total).append(" sessions done (").append(failed).append(" failed, ")
                .append(skipped).append(" skipped)");
        if (analysed > 0) {
            s.append(String.format(Locale.ROOT, ", %.2f sessions/s", ratePerS()));
        }
        if (done < total && Double.isFinite(remainingS())) {
            s.append(", about ").append(duration(remainingS())).append(" left");
        } else if (done == total) {
            s.append(", in ").append(duration(elapsedS));
        }
        return s.toString();
    }

    static String duration(double seconds) {
        long s = Math.round(seconds);
        if (s < 60) {
            return s + " s";
        }
        if (s < 3600) {
            return (s / 60) + " min " + (s % 60) + " s";
        }
        return (s / 3600) + " h " + (s % 3600 / 60) + " min";
    }
}
