package org.roundtable.scheme;

import io.quarkus.hibernate.orm.panache.PanacheRepository;
import jakarta.enterprise.context.ApplicationScoped;

@ApplicationScoped
public class SchemeRepository implements PanacheRepository<Scheme> {
}
