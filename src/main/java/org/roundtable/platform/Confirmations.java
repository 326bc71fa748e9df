package org.roundtable.platform;

import io.quarkus.qute.Location;
import io.quarkus.qute.Template;
import io.quarkus.qute.TemplateInstance;
import jakarta.enterprise.context.ApplicationScoped;

/** Renders the second step of an irreversible action ({@link Confirmation}) with the one layout. */
@ApplicationScoped
public class Confirmations {

    private final Template confirm;

    public Confirmations(@Location("web/confirm") Template confirm) {
        this.confirm = confirm;
    }

    /** The second step; {@code error} is shown above it (a missing reason), or null. */
    public TemplateInstance page(Confirmation confirmation, String error) {
        return confirm.data("c", confirmation).data("error", error);
    }
}
