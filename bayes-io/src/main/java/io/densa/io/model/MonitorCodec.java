package io.densa.io.model;

import io.densa.core.BayesSpace;
import io.densa.regression.surveillance.AlertHistory;
import io.densa.regression.surveillance.BaselineMonitor;
import io.densa.regression.surveillance.MonitorState;
import io.densa.regression.surveillance.RollingBaseline;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/** The payload of a surveillance monitor ("baseline-monitor"; see docs/model-format.md). */
final class MonitorCodec {
    private MonitorCodec() {
    }

    static void write(Out o, BaselineMonitor m) {
        RollingBaseline c = m.configuration();
        MonitorState s = m.state();
        o.begin();
        o.begin("configuration").integer("lags", c.longestLag()).ints("lagSet", c.lagSet())
                .real("forgetting", c.forgetting())
                .integer("window", c.window()).integer("calibrationPeriods", c.calibrationPeriods())
                .real("fdr", c.fdr()).real("bandLevel", c.bandLevel()).real("ridge", c.ridge())
                .integer("draws", c.draws()).int64("seed", c.seed())
                .bool("flaggedKeptOutOfCalibration", c.flaggedKeptOutOfCalibration());
        double[] bands = c.excessBands();
        if (bands == null) {
            o.nul("excessBands");
        } else {
            o.doubles("excessBands", bands);
        }
        o.end();
        CoreCodecs.space(o, "space", s.space());
        CoreCodecs.ids(o, "ids", Arrays.asList(s.ids()));
        o.integer("covariates", s.covariates());
        o.doubles("momentsZZ", s.momentsZZ()).doubles("momentsZY", s.momentsZY());
        o.integer("windowCount", s.windowCount()).doubles("windowZZ", s.windowZZ()).doubles("windowZY", s.windowZY());
        o.doubles("recent", s.recent()).doubles("recentVariances", s.recentVariances());
        o.integer("calibrationCount", s.calibrationCount()).doubles("calibration", s.calibration())
                .doubles("calibrationX", s.calibrationX()).ints("hasX", s.hasX())
                .ints("calibrationKept", s.calibrationKept());
        int n = s.history().size();
        int[] first = new int[n];
        int[] last = new int[n];
        int[] consecutive = new int[n];
        int[] flagged = new int[n];
        double[] displaced = new double[n];
        for (int i = 0; i < n; i++) {
            AlertHistory h = s.history().get(i);
            first[i] = h.firstFlagged();
            last[i] = h.lastFlagged();
            consecutive[i] = h.consecutive();
            flagged[i] = h.flaggedPeriods();
            displaced[i] = h.cumulativeDisplaced();
        }
        o.begin("history").ints("firstFlagged", first).ints("lastFlagged", last).ints("consecutive", consecutive)
                .ints("flaggedPeriods", flagged).doubles("cumulativeDisplaced", displaced).end();
        o.integer("lastPeriod", s.lastPeriod()).integer("absorbed", s.absorbed());
        o.end();
    }

    static BaselineMonitor read(Node p) {
        Node c = p.get("configuration");
        Node lagSetNode = c.optional("lagSet");
        int lags = c.get("lags").integer(1, lagSetNode == null ? 12 : RollingBaseline.MAX_LAG);
        int[] lagSet = lagSetNode == null ? null : lagSetNode.ints();
        double forgetting = c.get("forgetting").real();
        int window = c.get("window").integer(0, Integer.MAX_VALUE);
        int calibrationPeriods = c.get("calibrationPeriods").integer(1, Integer.MAX_VALUE);
        double fdr = c.get("fdr").real();
        double bandLevel = c.get("bandLevel").real();
        double ridge = c.get("ridge").real();
        int draws = c.get("draws").integer(99, Integer.MAX_VALUE);
        long seed = c.get("seed").longValue();
        Node excludeNode = c.optional("flaggedKeptOutOfCalibration");
        boolean exclude = excludeNode != null && excludeNode.bool();
        Node bandsNode = c.optional("excessBands");
        double[] bands = bandsNode == null ? new double[0] : bandsNode.doubles();
        RollingBaseline config = Codecs.restoring(c, () -> {
            RollingBaseline r = (lagSet == null ? RollingBaseline.withDefaults().withLags(lags)
                    : RollingBaseline.withDefaults().withLagSet(lagSet)).withCalibrationPeriods(calibrationPeriods)
                    .withFdr(fdr).withBandLevel(bandLevel).withRidge(ridge).withDraws(draws, seed);
            r = r.withFlaggedKeptOutOfCalibration(exclude).withExcessBands(bands);
            return window > 0 ? r.withWindow(window) : r.withForgetting(forgetting);
        });
        if (config.longestLag() != lags) {
            throw c.get("lags").error("is " + lags + " but the longest lag of lagSet is " + config.longestLag());
        }
        BayesSpace space = CoreCodecs.readSpace(p.get("space"));
        List<Node> idNodes = p.get("ids").list();
        int n = idNodes.size();
        String[] ids = new String[n];
        for (int i = 0; i < n; i++) {
            ids[i] = idNodes.get(i).text();
        }
        Node h = p.get("history");
        int[] first = h.get("firstFlagged").ints(n);
        int[] last = h.get("lastFlagged").ints(n);
        int[] consecutive = h.get("consecutive").ints(n);
        int[] flagged = h.get("flaggedPeriods").ints(n);
        // written before displaced events were kept: the overall excess against each unit's own total,
        // which is 0 (read as such)
        Node displacedNode = h.optional("cumulativeDisplaced");
        double[] displaced = displacedNode != null ? displacedNode.doubles(n) : h.get("cumulativeExcess").doubles(n);
        List<AlertHistory> history = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            history.add(new AlertHistory(ids[i], first[i], last[i], consecutive[i], flagged[i], displaced[i]));
        }
        int calibrationCount = p.get("calibrationCount").integer(0, Integer.MAX_VALUE);
        double[] calibrationX = p.get("calibrationX").doubles();
        Node keptNode = p.optional("calibrationKept");
        int[] kept;
        if (keptNode != null) {
            kept = keptNode.ints();
        } else {
            // written before flagged residuals could be left out: every one is used (one flag per x value,
            // whose count the monitor checks against calibrationCount × n)
            kept = new int[calibrationX.length];
            Arrays.fill(kept, 1);
        }
        MonitorState s = new MonitorState(space, ids, p.get("covariates").integer(0, Integer.MAX_VALUE),
                p.get("momentsZZ").doubles(), p.get("momentsZY").doubles(),
                p.get("windowCount").integer(0, Integer.MAX_VALUE), p.get("windowZZ").doubles(),
                p.get("windowZY").doubles(), p.get("recent").doubles(), p.get("recentVariances").doubles(),
                calibrationCount, p.get("calibration").doubles(), calibrationX, p.get("hasX").ints(), kept, history,
                p.get("lastPeriod").integer(Integer.MIN_VALUE, Integer.MAX_VALUE),
                p.get("absorbed").integer(1, Integer.MAX_VALUE));
        return Codecs.restoring(p, () -> BaselineMonitor.restore(config, s));
    }
}
