package org.edgewise.driver.cli;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Path;
import java.util.List;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreWriter;
import org.edgewise.driver.store.Variable;

/** Runs the CLI in-process and captures its exit status and output; writes test stores to disk. */
record CliRun(int status, String out, String err) {
    static final int[] ARITIES = {2, 3, 2, 2, 3};

    static CliRun of(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int status = EdgewiseCli.commandLine(new PrintWriter(out, true), new PrintWriter(err, true)).execute(args);
        return new CliRun(status, out.toString(), err.toString());
    }

    /** A store on disk (written and later read back through StoreWriter / StoreReader). */
    static ScoreStore store(Path dir, long seed, int d) {
        return store(dir, HeldOutData.table(seed, 80, ARITIES), ARITIES, d);
    }

    /** The store of {@code rows} (variables v0, v1, … with these arities, BDeu defaults) written to {@code dir}. */
    static ScoreStore store(Path dir, int[][] rows, int[] arities, int d) {
        List<Variable> vars = HeldOutData.variables(arities);
        ScoreStore s = InMemoryTally.tally(vars, rows, d, FamilyScore.withDefaults());
        StoreWriter.write(dir, s.manifest(), s.families(), s.logScores(), false);
        return s;
    }

    /** The single line of standard error, without its line break. */
    String errLine() {
        return err.strip();
    }
}
