package org.edgewise.driver.cli;

import org.edgewise.driver.UserError;
import picocli.CommandLine.Command;

/** Listed for {@code --help}; the launcher runs the real {@code tally} from the job module with Spark. */
@Command(name = "tally", description = "Spark job: scan a table once and write a score store (run through scripts/edgewise, which puts Spark on the classpath; see 'scripts/edgewise tally --help').")
final class TallyPlaceholder implements Runnable {
    @Override
    public void run() {
        throw new UserError("tally runs on Spark: start it with scripts/edgewise tally …");
    }
}
