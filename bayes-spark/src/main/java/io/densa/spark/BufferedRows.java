package io.densa.spark;

import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.NoSuchElementException;
import org.apache.spark.sql.Row;

/**
 * A partition's rows processed in batches: when the buffer is used up, {@link #fill} reads the next
 * batch from the input and adds the output rows to {@link #ready}; rows are handed out in order.
 */
abstract class BufferedRows implements Iterator<Row> {
    protected final Iterator<Row> in;
    protected final List<Row> ready = new ArrayList<>();
    private int next;

    BufferedRows(Iterator<Row> in) {
        this.in = in;
    }

    /** Reads at least one input row (the input has one) and adds the results to {@link #ready}. */
    protected abstract void fill();

    @Override
    public final boolean hasNext() {
        while (next >= ready.size()) {
            ready.clear();
            next = 0;
            if (!in.hasNext()) {
                return false;
            }
            fill();
        }
        return true;
    }

    @Override
    public final Row next() {
        if (!hasNext()) {
            throw new NoSuchElementException();
        }
        return ready.get(next++);
    }
}
