package org.edgewise.driver.result;

/**
 * A result that a command writes as JSON. {@link ResultJson} stamps every one with
 * {@code "formatVersion"} and {@code "kind"} as its first two fields — the one place they are
 * written — so a reader can tell what a file holds and refuse one it does not understand.
 */
public interface JsonResult {
    /** What the result is: {@code edges}, {@code prediction}, {@code effect}, {@code effects}, {@code scores}, {@code recovery}. */
    String kind();

    /** The version of this kind's format; raised when a field changes meaning or name, or a required one is added. */
    int formatVersion();
}
