package org.roundtable.scheme;

import io.quarkus.hibernate.orm.panache.PanacheRepository;
import jakarta.enterprise.context.ApplicationScoped;

import java.util.List;

@ApplicationScoped
public class MeasurandRepository implements PanacheRepository<Measurand> {

    public List<Measurand> ofScheme(long schemeId) {
        return list("schemeId = ?1", schemeId).stream()
                .sorted(java.util.Comparator.comparingInt(m -> ChemicalElement.atomicNumber(m.element)))
                .toList();
    }
}
