# Helpers for the engine test policies; a package without findings is
# loaded but never evaluated on its own.
package welfare.lib

# severity_if is {"severity": sev} when cond holds, else {}.
severity_if(cond, sev) := {"severity": sev} if cond

else := {}
