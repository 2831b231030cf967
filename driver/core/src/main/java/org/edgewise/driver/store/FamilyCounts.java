package org.edgewise.driver.store;

/**
 * Contingency counts of one family: child, sorted parent indices, and the counts N_ijk of every
 * parent configuration j that occurs in the data (unobserved configurations are not stored).
 *
 * <p>{@code configs[m]} is the mixed-radix index of the m-th observed configuration, the first
 * (lowest-index) parent most significant: j = Σ_p s_p · Π_{p' after p} r_{p'}. Configurations are
 * in increasing order. {@code counts[m*r + k]} is N_ijk for child state k. Memory: 8 bytes per
 * observed configuration plus 8·r per configuration for the counts.
 *
 * <p>Arrays are shared, not copied: treat them as read-only. Equality is by identity.
 */
public record FamilyCounts(int child, int[] parents, long[] configs, long[] counts) {

    /** The observed configurations (a store read without its counts has none to give: a bug to ask). */
    @Override
    public long[] configs() {
        if (configs == null) {
            throw new IllegalStateException("the store was read without its counts (StoreReader.readScores)");
        }
        return configs;
    }

    /** The counts N_ijk (a store read without its counts has none to give: a bug to ask). */
    @Override
    public long[] counts() {
        if (counts == null) {
            throw new IllegalStateException("the store was read without its counts (StoreReader.readScores)");
        }
        return counts;
    }

    /** Whether the counts were read. */
    public boolean hasCounts() {
        return counts != null;
    }

    /** Number of observed parent configurations. */
    public int rows() {
        return configs().length;
    }

    /** Total count Σ N_ijk (the number of rows counted). */
    public long total() {
        long s = 0;
        for (long c : counts()) {
            s += c;
        }
        return s;
    }
}
