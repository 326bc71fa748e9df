package org.roundtable.web;

import io.quarkus.test.junit.QuarkusTest;
import org.junit.jupiter.api.Test;

import static io.restassured.RestAssured.given;
import static org.hamcrest.Matchers.containsString;
import static org.hamcrest.Matchers.equalTo;
import static org.hamcrest.Matchers.matchesPattern;
import static org.hamcrest.Matchers.not;

@QuarkusTest
class HomePageTest {

    @Test
    void startPageIsServedWithStrictSecurityHeaders() {
        given().accept("text/html")
                .when().get("/")
                .then().statusCode(200)
                .header("Content-Security-Policy", containsString("frame-ancestors 'none'"))
                .header("X-Content-Type-Options", equalTo("nosniff"))
                .header("Cache-Control", equalTo("no-store"))
                .header(RequestIds.HEADER, matchesPattern("[0-9a-f]{24}"))
                .body(containsString("Proficiency testing for metals-analysis laboratories"));
    }

    @Test
    void unknownAddressGivesAProblemBodyWithoutInternals() {
        given().accept("application/json")
                .when().get("/no-such-page")
                .then().statusCode(404)
                .body("status", equalTo(404))
                .body("title", equalTo("Not found"))
                .body(not(containsString("Exception")));
    }

    @Test
    void unknownAddressGivesAnErrorPageToABrowser() {
        given().accept("text/html")
                .when().get("/no-such-page")
                .then().statusCode(404)
                .body(containsString("Nothing was found at this address."));
    }

    @Test
    void healthOpenApiAndSwaggerUiAreServed() {
        given().when().get("/q/health/ready").then().statusCode(200).body("status", equalTo("UP"));
        given().when().get("/q/openapi").then().statusCode(200).body(containsString("openapi"));
        given().when().get("/q/swagger-ui/").then().statusCode(200);
    }

    @Test
    void assetsAreCacheableButPagesAreNot() {
        given().when().get("/assets/roundtable.css")
                .then().statusCode(200)
                .header("Cache-Control", not(equalTo("no-store")));
    }
}
