package org.roundtable.platform;

/**
 * One page of a list that grows with laboratories, results or events: which page, how many rows a page holds
 * (never more than the page-size budget, {@link DisplaySettings#pageSize()}) and how many rows there are in
 * all. Pages count from 1; a page number past the end shows the last page.
 */
public record Paging(int page, int size, long total) {

    public Paging {
        if (size < 1) {
            throw new IllegalArgumentException("page size must be positive");
        }
        total = Math.max(0, total);
        long last = Math.max(1, (total + size - 1) / size);
        page = (int) Math.max(1, Math.min(page, last));
    }

    /** Page {@code requested} (null or below 1: the first) of {@code total} rows, {@code size} rows a page. */
    public static Paging of(Integer requested, int size, long total) {
        return new Paging(requested == null ? 1 : requested, size, total);
    }

    /** The number of rows before this page (for OFFSET). */
    public int offset() {
        return (page - 1) * size;
    }

    public int pages() {
        return (int) Math.max(1, (total + size - 1) / size);
    }

    public boolean hasPrevious() {
        return page > 1;
    }

    public boolean hasNext() {
        return page < pages();
    }

    public int previous() {
        return page - 1;
    }

    public int next() {
        return page + 1;
    }

    /** 1-based number of the first row shown (0 when there are none). */
    public long first() {
        return total == 0 ? 0 : offset() + 1L;
    }

    /** 1-based number of the last row shown. */
    public long last() {
        return Math.min(total, (long) page * size);
    }
}
