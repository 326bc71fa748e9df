package org.roundtable.demo;

import io.quarkus.test.junit.QuarkusTestProfile;
import java.util.List;
import java.util.Map;
import org.roundtable.testing.SmtpTestPort;

/**
 * A Quarkus test profile that starts the application on a database of its own, into which the demo scenario is
 * loaded at start-up ({@link DemoData}, as rounds-demo/start.sh does), with the page size of the running demo.
 * The global test resources are left out: the database comes from {@link DemoDatabase} (a fresh database on the
 * tests' PostgreSQL server), the test SMTP port from {@link SmtpTestPort}.
 *
 * <p>Quarkus starts afresh for each profile class, so every test class that must find the demo as it was loaded
 * declares its own subclass (an empty nested class). Loading takes about two minutes on two cores.
 */
public class DemoProfile implements QuarkusTestProfile {

    @Override
    public Map<String, String> getConfigOverrides() {
        return Map.of("roundtable.demo.enabled", "true", "roundtable.display.page-size", "50");
    }

    @Override
    public List<TestResourceEntry> testResources() {
        return List.of(new TestResourceEntry(DemoDatabase.class), new TestResourceEntry(SmtpTestPort.class));
    }

    @Override
    public boolean disableGlobalTestResources() {
        return true;
    }
}
