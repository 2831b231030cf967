package org.edgewise.driver.cli;

import java.io.BufferedOutputStream;
import java.io.FileDescriptor;
import java.io.FileOutputStream;
import java.io.FilterOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.io.OutputStreamWriter;
import java.io.PrintWriter;
import java.nio.charset.Charset;
import org.edgewise.driver.AtomicWrite;
import org.edgewise.driver.ErrorReport;
import org.edgewise.driver.Version;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * Entry point of the Spark-free commands. Thin: each subcommand parses, calls the library and
 * prints. A {@link org.edgewise.driver.UserError} or a bad option becomes one line on stderr and exit
 * status 2; anything else is a bug and prints a stack trace (exit 1), an
 * {@code IllegalArgumentException} included. {@code tally} is the Spark job, started by the launcher
 * from the job module's classpath; the usage footer names it so {@code --help} shows every command.
 */
@Command(name = "edgewise", mixinStandardHelpOptions = true, versionProvider = EdgewiseCli.VersionText.class,
        description = "Bayesian model averaging over network structures for discrete tables.%n"
                + "Commands: tally (Spark job: counts and family scores into a score store), then any of the others on the store.",
        footer = {"%nThe Spark job, started by scripts/edgewise from the job's classpath:",
                "  tally     Scan a table once and write a score store (see 'scripts/edgewise tally --help')."},
        subcommands = {CommandLine.HelpCommand.class, ScoresCommand.class,
                EdgesCommand.class, PredictCommand.class, EffectCommand.class, SimulateCommand.class, ReportCommand.class,
                CompareCommand.class, SampleCommand.class, ExportCommand.class})
public final class EdgewiseCli implements java.util.concurrent.Callable<Integer> {
    /** Exit status for a user mistake (bad option, bad file, damaged store). */
    public static final int USER_ERROR = ErrorReport.USER_MISTAKE;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    /** No command: a user's mistake, one line with the usage (exit status 2); {@code --help} prints the full text. */
    @Override
    public Integer call() {
        String usage = spec.commandLine().getHelp().synopsis(0).strip();
        spec.commandLine().getErr().println("edgewise: no command given; usage: " + usage + " (see edgewise --help)");
        spec.commandLine().getErr().flush();
        return USER_ERROR;
    }

    public static void main(String[] args) {
        System.exit(execute(args));
    }

    /** Runs a command line and returns its exit status (for tests and for {@link #main}). */
    public static int execute(String... args) {
        return execute(new FileOutputStream(FileDescriptor.out), new PrintWriter(System.err, true), args);
    }

    /**
     * Runs a command line writing its results to {@code stdout} and its messages to {@code err}. The
     * one place where standard output is flushed for the last time and checked: a write that failed
     * (a full disk, {@code /dev/full}, a closed pipe) ends in one line and exit status
     * {@link #OUTPUT_FAILED} instead of a truncated output and exit 0.
     */
    public static int execute(OutputStream stdout, PrintWriter err, String... args) {
        FailedWrite failed = new FailedWrite(new BufferedOutputStream(stdout, 1 << 16));
        PrintWriter out = new PrintWriter(new OutputStreamWriter(failed, Charset.defaultCharset()), true);
        CommandLine cl = commandLine(out, err);
        int status = cl.execute(args);
        if (out.checkError() && status == 0) { // checkError flushes
            String command = "edgewise";
            for (CommandLine.ParseResult r = cl.getParseResult(); r != null; r = r.subcommand()) {
                command = r.commandSpec().name();
            }
            err.println(command + ": cannot write standard output: " + failed.reason());
            err.flush();
            return OUTPUT_FAILED;
        }
        return status;
    }

    /** Exit status when standard output could not be written. */
    public static final int OUTPUT_FAILED = ErrorReport.BUG;

    /** Remembers the first failure of the stream under a {@code PrintWriter}, which keeps only a flag. */
    private static final class FailedWrite extends FilterOutputStream {
        private IOException first;

        FailedWrite(OutputStream out) {
            super(out);
        }

        @Override
        public void write(byte[] b, int off, int len) throws IOException {
            try {
                out.write(b, off, len);
            } catch (IOException e) {
                throw remember(e);
            }
        }

        @Override
        public void write(int b) throws IOException {
            try {
                out.write(b);
            } catch (IOException e) {
                throw remember(e);
            }
        }

        @Override
        public void flush() throws IOException {
            try {
                out.flush();
            } catch (IOException e) {
                throw remember(e);
            }
        }

        private IOException remember(IOException e) {
            if (first == null) {
                first = e;
            }
            return e;
        }

        String reason() {
            return first == null ? "write error" : AtomicWrite.reason(first);
        }
    }

    /** A configured command line writing to {@code out} and {@code err}. */
    public static CommandLine commandLine(PrintWriter out, PrintWriter err) {
        return configure(new CommandLine(new EdgewiseCli()), out, err);
    }

    /** Applies Edgewise's error handling to any command line (the job's {@code tally} uses it too). */
    public static CommandLine configure(CommandLine cl, PrintWriter out, PrintWriter err) {
        cl.setOut(out);
        cl.setErr(err);
        cl.setCaseInsensitiveEnumValuesAllowed(true);
        cl.setParameterExceptionHandler((ex, a) -> {
            CommandLine c = ex.getCommandLine();
            String path = badPath(ex);
            if (path != null) {
                c.getErr().println(c.getCommandName() + ": " + path);
                return USER_ERROR;
            }
            c.getErr().println(c.getCommandName() + ": " + ex.getMessage()
                    + " (see " + c.getCommandSpec().qualifiedName() + " --help)");
            return USER_ERROR;
        });
        cl.setExecutionExceptionHandler((ex, c, parsed) -> {
            return ErrorReport.report(c.getCommandName(), CliNames.worded(ex), c.getErr());
        });
        return cl;
    }

    /**
     * A file-name option the JVM could not turn into a path (an {@code InvalidPathException}: a NUL, or
     * a character the platform encoding cannot represent), as {@link org.edgewise.driver.Checks#path}
     * words it naming the option; null for any other parameter error.
     */
    public static String badPath(CommandLine.ParameterException ex) {
        // picocli keeps only the text of the converter's InvalidPathException: convert the value again
        if (ex.getValue() != null && ex.getArgSpec() instanceof CommandLine.Model.OptionSpec o
                && o.type() == java.nio.file.Path.class) {
            try {
                org.edgewise.driver.Checks.path(ex.getValue(), o.longestName());
            } catch (org.edgewise.driver.UserError e) {
                return e.getMessage();
            }
        }
        return null;
    }

    /** The program version, from the build (the core's {@link Version}). */
    public static final class VersionText implements CommandLine.IVersionProvider {
        @Override
        public String[] getVersion() {
            return new String[] {"edgewise " + Version.PROGRAM};
        }
    }
}
