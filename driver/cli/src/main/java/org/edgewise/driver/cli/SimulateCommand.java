package org.edgewise.driver.cli;

import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.edgewise.driver.AtomicWrite;
import org.edgewise.driver.UserError;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.NetworkReader;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code simulate}: forward-sample a table from a network file. */
@Command(name = "simulate", mixinStandardHelpOptions = true,
        description = "Draw a table of rows from a network file (JSON, see docs/report.md) by forward sampling; "
                + "a seed fixes the sample.")
final class SimulateCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Option(names = "--network", required = true, paramLabel = "FILE", description = "network JSON file") Path network;

    @Option(names = "--rows", required = true, paramLabel = "N", description = "number of rows to draw") long rows;

    @Option(names = "--seed", defaultValue = "1", paramLabel = "S", description = "random seed (default ${DEFAULT-VALUE})") long seed;

    @Mixin
    OutputOptions output = new OutputOptions();

    @Option(names = "--format", defaultValue = "csv", paramLabel = "csv", description = "output format (default ${DEFAULT-VALUE})") String format;


    @Override
    public Integer call() throws IOException {
        output.check();
        if (!format.toLowerCase(Locale.ROOT).equals("csv")) {
            throw new UserError("--format must be csv, got '" + format + "'");
        }
        if (rows < 0) {
            throw new UserError("--rows must be 0 or more, got " + rows);
        }
        Network net = NetworkReader.read(network);
        ForwardSampler sampler = new ForwardSampler(net);
        if (output.out == null) {
            PrintWriter w = spec.commandLine().getOut();
            // the sampler writes whole labels per chunk, so decoding chunk by chunk never splits a character
            OutputStream o = new OutputStream() {
                @Override
                public void write(int b) {
                    w.write(b);
                }

                @Override
                public void write(byte[] b, int off, int len) {
                    w.write(new String(b, off, len, StandardCharsets.UTF_8));
                }
            };
            sampler.writeCsv(rows, seed, o, n -> { });
            w.flush();
            return 0;
        }
        try (Progress p = Progress.start("simulate", rows)) {
            AtomicWrite.file(output.out, output.overwrite, tmp -> {
                try (OutputStream o = new BufferedOutputStream(Files.newOutputStream(tmp), 1 << 16)) {
                    sampler.writeCsv(rows, seed, o, p::step);
                }
            });
        } catch (IOException e) {
            throw new UserError("cannot write " + output.out + ": " + AtomicWrite.reason(e));
        }
        spec.commandLine().getErr().println("simulate: wrote " + rows + " rows of " + net.size()
                + " variables to " + output.out + " (seed " + seed + ")");
        return 0;
    }
}
