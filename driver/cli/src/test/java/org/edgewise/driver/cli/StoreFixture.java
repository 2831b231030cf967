package org.edgewise.driver.cli;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Path;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.io.TempDir;

/** Base of the command tests that need one test store on disk ({@link CliRun#store}) and its in-memory twin. */
abstract class StoreFixture {
    static final ObjectMapper JSON = new ObjectMapper();
    /** An order of the store's five variables the known-order commands are given. */
    static final String ORDER = "v3,v0,v4,v1,v2";

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
