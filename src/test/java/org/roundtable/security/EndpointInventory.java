package org.roundtable.security;

import com.tngtech.archunit.core.domain.JavaClass;
import com.tngtech.archunit.core.domain.JavaMethod;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import io.quarkus.security.Authenticated;
import jakarta.annotation.security.DenyAll;
import jakarta.annotation.security.PermitAll;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.DELETE;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.PATCH;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.PUT;
import jakarta.ws.rs.Path;

import java.lang.annotation.Annotation;
import java.lang.reflect.Method;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;

/** Every REST and page endpoint of the application, found by reflection over the compiled classes. */
final class EndpointInventory {

    record Endpoint(String method, String path, Method javaMethod) {
        String key() {
            return method + " " + path;
        }

        boolean unsafe() {
            return !method.equals("GET");
        }

        boolean hasSecurityPolicy() {
            return hasAny(javaMethod.getAnnotations()) || hasAny(javaMethod.getDeclaringClass().getAnnotations());
        }

        private static boolean hasAny(Annotation[] annotations) {
            for (Annotation a : annotations) {
                Class<?> type = a.annotationType();
                if (type == RolesAllowed.class || type == PermitAll.class || type == Authenticated.class || type == DenyAll.class) {
                    return true;
                }
            }
            return false;
        }
    }

    private static final Map<Class<? extends Annotation>, String> VERBS = Map.of(
            GET.class, "GET", POST.class, "POST", PUT.class, "PUT", DELETE.class, "DELETE", PATCH.class, "PATCH");

    private EndpointInventory() {
    }

    static List<Endpoint> all() {
        List<Endpoint> endpoints = new ArrayList<>();
        for (JavaClass type : new ClassFileImporter().withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
                .importPackages("org.roundtable")) {
            if (!type.isAnnotatedWith(Path.class)) {
                continue;
            }
            String base = type.getAnnotationOfType(Path.class).value();
            for (JavaMethod method : type.getMethods()) {
                for (Map.Entry<Class<? extends Annotation>, String> verb : VERBS.entrySet()) {
                    if (method.isAnnotatedWith(verb.getKey())) {
                        String sub = method.isAnnotatedWith(Path.class) ? method.getAnnotationOfType(Path.class).value() : "";
                        endpoints.add(new Endpoint(verb.getValue(), join(base, sub), method.reflect()));
                    }
                }
            }
        }
        endpoints.sort(Comparator.comparing(Endpoint::key));
        return endpoints;
    }

    static String join(String base, String sub) {
        String path = ("/" + base + "/" + sub).replaceAll("/+", "/");
        return path.length() > 1 && path.endsWith("/") ? path.substring(0, path.length() - 1) : path;
    }
}
