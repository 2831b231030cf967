package org.edgewise.driver.cli;

import java.nio.file.Path;
import picocli.CommandLine.Option;

/** {@code --sample DIR}, declared once: the averaging commands answer from it, {@code export} takes a network from it. */
public final class SampleOption {
    @Option(names = "--sample", paramLabel = "DIR", description = "a posterior sample saved by the sample command "
            + "(nothing is sampled again; --store must be the store it was drawn from)")
    public Path sample;
}
