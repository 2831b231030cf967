package org.edgewise.driver.cli;

import java.nio.file.Path;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.io.TempDir;

/** Base of the command tests that need one test store on disk ({@link CliRun#store}) and its in-memory twin. */
abstract class StoreFixture {
    @TempDir
    Path dir;
    /** The store directory the commands read. */
    Path store;
    /** The same store, in memory, for comparisons with the library. */
    ScoreStore mem;

    /** The seed of the held-out table the store is tallied from. */
    abstract long seed();

    @BeforeEach
    void writeStore() {
        store = dir.resolve("store");
        mem = CliRun.store(store, seed(), 2);
    }
}
