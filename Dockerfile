# A runnable image of the Serimetry service (`serimetry serve`).
FROM mcr.microsoft.com/dotnet/sdk:10.0 AS build
WORKDIR /src
COPY . .
RUN dotnet publish cli/Serimetry.Cli.csproj -c Release -o /app --nologo

FROM mcr.microsoft.com/dotnet/aspnet:10.0
WORKDIR /app
COPY --from=build /app .
VOLUME ["/data"]
USER app
ENTRYPOINT ["dotnet", "serimetry.dll"]
# The HTTP service (`serve`) is being built; until then the image runs the demo into the data volume.
CMD ["demo", "--out", "/data/demo"]
