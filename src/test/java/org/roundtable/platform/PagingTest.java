package org.roundtable.platform;

import org.junit.jupiter.api.Test;

import static org.assertj.core.api.Assertions.assertThat;

class PagingTest {

    @Test
    void pagesCountFromOneAndStayWithinTheRows() {
        Paging p = Paging.of(2, 50, 120);
        assertThat(p.offset()).isEqualTo(50);
        assertThat(p.pages()).isEqualTo(3);
        assertThat(p.first()).isEqualTo(51);
        assertThat(p.last()).isEqualTo(100);
        assertThat(p.hasPrevious()).isTrue();
        assertThat(p.hasNext()).isTrue();
        assertThat(Paging.of(9, 50, 120).page()).isEqualTo(3);
        assertThat(Paging.of(9, 50, 120).last()).isEqualTo(120);
        assertThat(Paging.of(null, 50, 120).page()).isEqualTo(1);
        assertThat(Paging.of(-4, 50, 120).page()).isEqualTo(1);
    }

    @Test
    void anEmptyListIsOnePageWithNoRows() {
        Paging p = Paging.of(1, 50, 0);
        assertThat(p.pages()).isEqualTo(1);
        assertThat(p.first()).isZero();
        assertThat(p.last()).isZero();
        assertThat(p.hasNext()).isFalse();
        assertThat(p.hasPrevious()).isFalse();
    }
}
