package org.edgewise.driver.cli;

import java.nio.file.Path;
import org.edgewise.driver.Checks;
import java.util.LinkedHashMap;
import java.util.Map;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Model.OptionSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/** {@code --out} and {@code --overwrite}, declared once for every command that writes a result. */
public final class OutputOptions {
    @Option(names = "--out", paramLabel = "FILE", description = "write the result to FILE instead of standard output "
            + "(written to a temporary sibling, then renamed: never half-written)")
    public Path out;

    @Option(names = "--overwrite", description = "replace an existing --out file (only a regular file: never a directory,"
            + " link, FIFO or device, nor one of the command's inputs)")
    public boolean overwrite;

    /** The command this mixin belongs to: its other file options are its inputs. */
    @Spec(Spec.Target.MIXEE)
    CommandSpec command;

    /**
     * Checks {@code --out} before any work ({@link Output#check}), and that it is none of the
     * command's inputs: every other option whose value is a file ({@code --store}, {@code --result} …);
     * {@code --overwrite} alone is refused.
     */
    public void check() {
        Checks.notApplicable(overwrite && out == null, "--overwrite", "without --out",
                "it lets --out replace an existing file; standard output replaces nothing");
        if (out != null) {
            org.edgewise.driver.AtomicWrite.checkNotInput(out, "--out", inputs());
        }
        Output.check(out, overwrite);
    }

    /** The command's file options other than {@code --out} that were given, by name. */
    Map<String, Path> inputs() {
        Map<String, Path> in = new LinkedHashMap<>();
        if (command != null) {
            for (OptionSpec o : command.options()) {
                if (o.type() == Path.class && !o.longestName().equals("--out") && o.getValue() != null) {
                    in.put(o.longestName(), o.getValue());
                }
            }
        }
        return in;
    }

    /** Writes {@code text} to {@code --out} atomically (replacing a file only with {@code --overwrite}), or to standard output. */
    public void write(CommandSpec spec, String text) {
        Output.write(spec, out, overwrite, text);
    }

    /** Writes {@code value} as JSON to {@code --out} atomically, replacing a file only with {@code --overwrite}. */
    public void writeJson(Object value) {
        org.edgewise.driver.result.ResultJson.write(out, overwrite, value);
    }
}
