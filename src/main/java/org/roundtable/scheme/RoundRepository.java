package org.roundtable.scheme;

import io.quarkus.hibernate.orm.panache.PanacheRepository;
import jakarta.enterprise.context.ApplicationScoped;

@ApplicationScoped
public class RoundRepository implements PanacheRepository<Round> {
}
