package org.roundtable.account;

import io.quarkus.hibernate.orm.panache.PanacheRepository;
import jakarta.enterprise.context.ApplicationScoped;

@ApplicationScoped
public class ApiTokenRepository implements PanacheRepository<ApiToken> {
}
