package org.edgewise.driver.cli;

import java.nio.file.Path;
import org.edgewise.driver.Checks;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;

/** {@code --out} and {@code --overwrite}, declared once for every command that writes a result. */
public final class OutputOptions {
    @Option(names = "--out", paramLabel = "FILE", description = "write the result to FILE instead of standard output "
            + "(written to a temporary sibling, then renamed: never half-written)")
    public Path out;

    @Option(names = "--overwrite", description = "replace an existing --out file (never a directory)")
    public boolean overwrite;

    /** Checks {@code --out} before any work ({@link Output#check}); {@code --overwrite} alone is refused. */
    public void check() {
        Checks.notApplicable(overwrite && out == null, "--overwrite", "without --out",
                "it lets --out replace an existing file; standard output replaces nothing");
        Output.check(out, overwrite);
    }

    /** Writes {@code text} to {@code --out} atomically, or to standard output. */
    public void write(CommandSpec spec, String text) {
        Output.write(spec, out, text);
    }
}
