package io.densa.spark;

import java.util.List;
import org.apache.spark.sql.Row;

/** Reading array columns of rows. */
final class SparkRows {
    private SparkRows() {
    }

    /** The array&lt;double&gt; at column i as a fresh double[] (null entries are an error naming the entry). */
    static double[] doubles(Row r, int i) {
        if (r.isNullAt(i)) {
            throw new IllegalArgumentException("column " + r.schema().fields()[i].name() + " is null");
        }
        List<Object> l = r.getList(i);
        double[] out = new double[l.size()];
        for (int j = 0; j < out.length; j++) {
            Object o = l.get(j);
            if (o == null) {
                throw new IllegalArgumentException("column " + r.schema().fields()[i].name() + ", entry " + j
                        + " is null");
            }
            out[j] = ((Number) o).doubleValue();
        }
        return out;
    }
}
