package org.edgewise.driver.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.Locale;
import org.edgewise.driver.AtomicWrite;
import org.edgewise.driver.UserError;
import org.edgewise.driver.result.ResultJson;
import picocli.CommandLine.Model.CommandSpec;

/** The {@code --format} and {@code --out} handling that the output commands share. */
final class Output {
    private Output() {
    }

    /** The {@code --format} value in lower case; refused unless it is {@code first} or {@code second}. */
    static String format(String given, String first, String second) {
        String fmt = given.toLowerCase(Locale.ROOT);
        if (!fmt.equals(first) && !fmt.equals(second)) {
            throw new UserError("--format must be " + first + " or " + second + ", got '" + given + "'");
        }
        return fmt;
    }

    /**
     * Checks {@code --out} before any work: an existing file is replaced only with {@code --overwrite},
     * a directory never, and its directory must be writable. Nothing to check for standard output.
     */
    static void check(Path out, boolean overwrite) {
        if (out != null) {
            AtomicWrite.checkFile(out, overwrite, "--out", "--overwrite");
        }
    }

    /** Writes {@code text} to {@code out} atomically (an existing file replaced only with
     * {@code overwrite}), or to standard output when {@code out} is null. */
    static void write(CommandSpec spec, Path out, boolean overwrite, String text) {
        if (out != null) {
            ResultJson.writeText(out, overwrite, text);
        } else {
            PrintWriter w = spec.commandLine().getOut();
            w.print(text);
            w.flush();
        }
    }
}
