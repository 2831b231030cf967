package org.edgewise.driver.posterior;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.file.Path;

/** Test access to the package-private DAG writer: a sample read back and written again, as bytes. */
public final class SampleFileAccess {
    private SampleFileAccess() {
    }

    public static byte[] rewrite(Path dir) throws IOException {
        SampleFile.Loaded l = SampleFile.read(dir, null, null);
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        SampleFile.writeDags(out, l.dags());
        return out.toByteArray();
    }
}
