package org.roundtable.web;

import jakarta.ws.rs.core.MultivaluedMap;
import org.jboss.resteasy.reactive.server.ServerRequestFilter;
import org.jboss.resteasy.reactive.server.WithFormRead;
import org.jboss.resteasy.reactive.server.core.ResteasyReactiveRequestContext;
import org.jboss.resteasy.reactive.server.core.multipart.FormData;
import org.jboss.resteasy.reactive.server.multipart.FormValue;
import org.jboss.resteasy.reactive.server.spi.ResteasyReactiveContainerRequestContext;
import org.roundtable.platform.TextInput;

import java.util.List;
import java.util.Map;

/**
 * Applies {@link TextInput}'s rule to every query parameter and every text field of a form (URL-encoded or
 * multipart; uploaded files are left to their intake) before any endpoint sees them: a control character is
 * answered with 400 and the field named, instead of failing deep down (PostgreSQL refuses NUL in text).
 * JSON strings get the same rule from {@link JsonText}.
 */
public class TextInputFilter {

    @ServerRequestFilter(priority = 900)
    @WithFormRead
    public void refuseControlCharacters(ResteasyReactiveContainerRequestContext context) {
        MultivaluedMap<String, String> query = context.getUriInfo().getQueryParameters();
        for (Map.Entry<String, List<String>> parameter : query.entrySet()) {
            TextInput.require(parameter.getKey(), parameter.getKey());
            for (String value : parameter.getValue()) {
                TextInput.require(parameter.getKey(), value);
            }
        }
        FormData form = ((ResteasyReactiveRequestContext) context.getServerRequestContext()).getFormData();
        if (form == null) {
            return;
        }
        for (String name : form) {
            TextInput.require(name, name);
            for (FormValue value : form.get(name)) {
                if (!value.isFileItem()) {
                    TextInput.require(name, value.getValue());
                }
            }
        }
    }
}
